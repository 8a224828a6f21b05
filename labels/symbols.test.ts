import bwipjs from 'bwip-js/node';
import { describe, expect, it } from 'vitest';
import { LabelError } from './errors';
import { type EncodedSymbol, MAX_CODE_LENGTH, QUIET_ZONE_MODULES, codeProblem, encodeSymbol, symbolContent } from './symbols';

/** Rebuilds the module grid from the merged rectangles (true = dark). */
function grid(symbol: EncodedSymbol): boolean[][] {
  const g = Array.from({ length: symbol.heightModules }, () => Array<boolean>(symbol.widthModules).fill(false));
  for (const r of symbol.rects) {
    for (let y = r.y; y < r.y + r.h; y++) {
      for (let x = r.x; x < r.x + r.w; x++) {
        const row = g[y];
        if (row === undefined || row[x] === true) throw new Error(`rectangles overlap or overflow at ${x},${y}`);
        row[x] = true;
      }
    }
  }
  return g;
}

describe('codeProblem', () => {
  it("accepts Halfmark's code shapes, including a final '*' or '?'", () => {
    for (const code of ['S26-00157-K', 'S26-00157B-*', 'C-00042-?', 'U-7KQ4M2-?', 'U-7KQ4M2-*']) {
      expect(codeProblem(code)).toBeUndefined();
    }
  });

  it('refuses empty, spaced, non-ASCII and over-long codes', () => {
    expect(codeProblem('')).toMatch(/missing/);
    expect(codeProblem(undefined)).toMatch(/missing/);
    expect(codeProblem('S26 00157-K')).toMatch(/space/);
    expect(codeProblem('S26-00157-É')).toMatch(/ASCII/);
    expect(codeProblem('S'.repeat(MAX_CODE_LENGTH + 1))).toMatch(/longer/);
    expect(codeProblem('S'.repeat(MAX_CODE_LENGTH))).toBeUndefined();
  });
});

describe('encodeSymbol: Data Matrix', () => {
  it('makes a 10 × 10 symbol for "123456" and for "A" (ISO/IEC 16022 Annex R, CHECKS.md [copy][run])', () => {
    expect(encodeSymbol('datamatrix', '123456')).toMatchObject({ widthModules: 10, heightModules: 10 });
    expect(encodeSymbol('datamatrix', 'A')).toMatchObject({ widthModules: 10, heightModules: 10 });
  });

  it('keeps exactly the dark modules bwip-js gives, merged into non-overlapping runs', () => {
    const code = 'S26-00157B-*';
    const raw = bwipjs.raw('datamatrix', code, {})[0];
    if (raw === undefined || !('pixs' in raw)) throw new Error('no matrix');
    const g = grid(encodeSymbol('datamatrix', code));
    const flat = g.flat().map((dark) => (dark ? 1 : 0));
    expect(flat).toEqual(raw.pixs);
    // Runs are maximal: fewer rectangles than dark modules.
    expect(encodeSymbol('datamatrix', code).rects.length).toBeLessThan(flat.filter((d) => d === 1).length);
  });

  it('has the finder pattern: solid left column and bottom row, alternating top row and right column', () => {
    // The L-shaped finder and the clock track are how every Data Matrix reader locates the
    // symbol (ISO/IEC 16022 symbol structure, from memory).
    const g = grid(encodeSymbol('datamatrix', 'S26-00157-K'));
    const n = g.length;
    const size = g[0]?.length ?? 0;
    for (let y = 0; y < n; y++) expect(g[y]?.[0]).toBe(true);
    for (let x = 0; x < size; x++) expect(g[n - 1]?.[x]).toBe(true);
    for (let x = 0; x < size; x++) expect(g[0]?.[x]).toBe(x % 2 === 0);
    for (let y = 0; y < n; y++) expect(g[y]?.[size - 1]).toBe((n - 1 - y) % 2 === 0);
  });

  it('names the code and the label when bwip-js refuses it', () => {
    try {
      encodeSymbol('datamatrix', 'S26 00157', 3);
      throw new Error('encoded a code with a space');
    } catch (err) {
      expect(err).toBeInstanceOf(LabelError);
      expect((err as LabelError).code).toBe('code-not-encodable');
      expect((err as LabelError).labelIndex).toBe(3);
    }
  });
});

describe('encodeSymbol: Code 128', () => {
  it('gives 11 modules per symbol character plus a 13-module stop (ISO/IEC 15417, from memory)', () => {
    // "PJJ123C": start, 7 data characters, check, stop → 11 × 9 + 13 = 112 modules.
    // "HI345678": start, H, I, Code C, 34, 56, 78, check, stop → 11 × 8 + 13 = 101 modules
    // (the code-set switch is the one CHECKS.md's worked check-symbol example uses [doc]).
    expect(encodeSymbol('code128', 'PJJ123C').widthModules).toBe(112);
    expect(encodeSymbol('code128', 'HI345678').widthModules).toBe(101);
  });

  it('has three bars per symbol character and four in the stop, each 1 to 4 modules wide', () => {
    const s = encodeSymbol('code128', 'PJJ123C');
    expect(s.rects.length).toBe(9 * 3 + 4);
    for (const r of s.rects) {
      expect(r.w).toBeGreaterThanOrEqual(1);
      expect(r.w).toBeLessThanOrEqual(4);
      expect([r.y, r.h]).toEqual([0, 1]);
    }
    // Starts with a bar at module 0 and ends with the stop's final bar on the last module.
    expect(s.rects[0]?.x).toBe(0);
    const last = s.rects.at(-1);
    expect((last?.x ?? 0) + (last?.w ?? 0)).toBe(s.widthModules);
  });

  it('keeps quiet zones of 10 modules for Code 128 and 1 module for Data Matrix', () => {
    expect(QUIET_ZONE_MODULES).toEqual({ code128: 10, datamatrix: 1 });
  });
});

describe('symbolContent', () => {
  it('fills all rectangles as one black path in its own graphics state', () => {
    const s = encodeSymbol('code128', 'C-00042-*');
    const content = symbolContent(s, { xPt: 10, topPt: 100, moduleWidthPt: 0.75, moduleHeightPt: 30 });
    const lines = content.trim().split('\n');
    expect(lines[0]).toBe('q 0 g');
    expect(lines.at(-1)).toBe('f Q');
    expect(lines.filter((l) => l.endsWith(' re')).length).toBe(s.rects.length);
    expect(content.match(/\bf\b/g)?.length).toBe(1);
    // First bar: x = 10 pt, bottom = 100 - 30 = 70 pt, 30 pt tall.
    const first = s.rects[0];
    expect(lines[1]).toBe(`10 70 ${(first?.w ?? 0) * 0.75} 30 re`);
  });

  it('places Data Matrix rows top-down from the given top edge', () => {
    const s = encodeSymbol('datamatrix', 'A');
    const content = symbolContent(s, { xPt: 0, topPt: 10, moduleWidthPt: 1, moduleHeightPt: 1 });
    // The top row starts dark at the left (finder clock track): a 1 × 1 rectangle from y 9 to 10.
    expect(content.split('\n')[1]).toBe('0 9 1 1 re');
    expect(content).not.toMatch(/e[-+]\d/);
  });
});
