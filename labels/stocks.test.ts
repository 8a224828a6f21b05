import { describe, expect, it } from 'vitest';
import { LabelError, MAX_LABELS_PER_PDF, labelRects, listStocks } from './render';
import { findStock, positionsPerPage } from './stocks';

/** Positions on the page must match the stock within 0.5 mm (issue 6). */
const near = (actual: number, expected: number): void => expect(Math.abs(actual - expected)).toBeLessThan(0.5);

describe('listStocks', () => {
  it('offers at least two thermal rolls and sheets on A4 and US Letter, each under its own key', () => {
    const stocks = listStocks();
    expect(new Set(stocks.map((s) => s.key)).size).toBe(stocks.length);
    expect(stocks.filter((s) => s.kind === 'roll').length).toBeGreaterThanOrEqual(2);
    // A4 is 210 × 297 mm (ISO 216, from memory); US Letter is 8.5 × 11 in = 215.9 × 279.4 mm
    // (1 in = 25.4 mm exactly, NIST SP 811).
    const a4 = stocks.find((s) => s.kind === 'sheet' && s.pageWidthMm === 210 && s.pageHeightMm === 297);
    const letter = stocks.find((s) => s.kind === 'sheet' && Math.abs(s.pageWidthMm - 215.9) < 1e-9 && Math.abs(s.pageHeightMm - 279.4) < 1e-9);
    expect(a4).toBeDefined();
    expect(letter).toBeDefined();
  });

  it.each(listStocks().map((s) => [s.key, s] as const))('%s: the grid fits its page and its labels do not overlap', (_key, s) => {
    const right = s.marginLeftMm + s.columns * s.labelWidthMm + (s.columns - 1) * s.gapXMm;
    const bottom = s.marginTopMm + s.rows * s.labelHeightMm + (s.rows - 1) * s.gapYMm;
    expect(right).toBeLessThanOrEqual(s.pageWidthMm + 1e-9);
    expect(bottom).toBeLessThanOrEqual(s.pageHeightMm + 1e-9);
    // Sheets are cut symmetrically left to right and top to bottom (common practice).
    near(s.pageWidthMm - right, s.marginLeftMm);
    near(s.pageHeightMm - bottom, s.marginTopMm);
    expect(s.gapXMm).toBeGreaterThanOrEqual(0);
    expect(s.gapYMm).toBeGreaterThanOrEqual(0);
    expect(s.name).toMatch(/\d+(\.\d+)? × \d+(\.\d+)? mm/);
    if (s.kind === 'roll') expect([s.labelWidthMm, s.labelHeightMm]).toEqual([s.pageWidthMm, s.pageHeightMm]);
  });
});

describe('labelRects', () => {
  it('places A4 3 × 8 labels of 70 × 37 mm edge to edge with 0.5 mm above and below', () => {
    // Expected positions written out from the sheet's dimensions: 3 × 70 = 210 mm across,
    // 8 × 37 = 296 mm down, so the grid starts 0.5 mm from the top edge.
    const rects = labelRects('a4-3x8', 24);
    near(rects[0]?.xMm ?? NaN, 0);
    near(rects[0]?.yMm ?? NaN, 0.5);
    near(rects[1]?.xMm ?? NaN, 70);
    near(rects[2]?.xMm ?? NaN, 140);
    near(rects[3]?.yMm ?? NaN, 37.5);
    near(rects[23]?.xMm ?? NaN, 140);
    near(rects[23]?.yMm ?? NaN, 259.5);
    expect(rects.every((r) => r.page === 0 && r.widthMm === 70 && r.heightMm === 37)).toBe(true);
  });

  it('places US Letter 3 × 10 labels of 2⅝ × 1 in with 3/16 in sides, 1/8 in gaps and a 1/2 in top', () => {
    // 3/16 in = 4.7625 mm; 2⅝ in = 66.675 mm; 1/8 in = 3.175 mm; 1/2 in = 12.7 mm (1 in = 25.4 mm).
    const rects = labelRects('letter-3x10', 30);
    near(rects[0]?.xMm ?? NaN, 4.7625);
    near(rects[0]?.yMm ?? NaN, 12.7);
    near(rects[1]?.xMm ?? NaN, 4.7625 + 66.675 + 3.175);
    near(rects[29]?.xMm ?? NaN, 4.7625 + 2 * (66.675 + 3.175));
    near(rects[29]?.yMm ?? NaN, 12.7 + 9 * 25.4);
    near(rects[29]?.widthMm ?? NaN, 66.675);
  });

  it('starts at a given position on a partly used sheet and carries on over the next sheet', () => {
    const rects = labelRects('a4-3x8', 4, 23);
    expect(rects.map((r) => [r.page, r.position, r.row, r.column])).toEqual([
      [0, 23, 7, 1],
      [0, 24, 7, 2],
      [1, 1, 0, 0],
      [1, 2, 0, 1],
    ]);
    near(rects[0]?.xMm ?? NaN, 70);
    near(rects[0]?.yMm ?? NaN, 0.5 + 7 * 37);
    near(rects[2]?.xMm ?? NaN, 0);
  });

  it('puts each roll label on a page of its own at the page origin', () => {
    const rects = labelRects('roll-57x32', 3);
    expect(rects.map((r) => [r.page, r.xMm, r.yMm, r.widthMm, r.heightMm])).toEqual([
      [0, 0, 0, 57, 32],
      [1, 0, 0, 57, 32],
      [2, 0, 0, 57, 32],
    ]);
  });

  it('gives 42 A4 pages for 1,000 labels, the last one at position 16', () => {
    const rects = labelRects('a4-3x8', 1000);
    const a4 = findStock('a4-3x8');
    expect(a4 && positionsPerPage(a4)).toBe(24);
    expect(rects.at(-1)?.page).toBe(41);
    expect(rects.at(-1)?.position).toBe(1000 - 41 * 24);
  });

  it('refuses an unknown stock, no labels, too many labels and a start off the sheet', () => {
    const codeOf = (f: () => unknown): string => {
      try {
        f();
      } catch (err) {
        if (err instanceof LabelError) return err.code;
        throw err;
      }
      return 'no error';
    };
    expect(codeOf(() => labelRects('a5-2x2', 1))).toBe('unknown-stock');
    expect(codeOf(() => labelRects('a4-3x8', 0))).toBe('no-labels');
    expect(codeOf(() => labelRects('a4-3x8', MAX_LABELS_PER_PDF + 1))).toBe('too-many-labels');
    expect(codeOf(() => labelRects('a4-3x8', MAX_LABELS_PER_PDF))).toBe('no error');
    expect(codeOf(() => labelRects('a4-3x8', 1, 0))).toBe('bad-start-position');
    expect(codeOf(() => labelRects('a4-3x8', 1, 25))).toBe('bad-start-position');
    expect(codeOf(() => labelRects('letter-3x10', 1, 30))).toBe('no error');
    expect(codeOf(() => labelRects('roll-51x25', 1, 2))).toBe('bad-start-position');
  });
});
