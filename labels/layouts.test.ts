import { describe, expect, it } from 'vitest';
import { LabelError } from './errors';
import {
  LABEL_KINDS,
  MAX_CODE128_MODULE_MM,
  MAX_DATAMATRIX_MODULE_MM,
  MIN_BAR_HEIGHT_MM,
  MIN_BAR_HEIGHT_RATIO,
  MIN_CODE128_MODULE_MM,
  MIN_DATAMATRIX_MODULE_MM,
  MIN_TEXT_PT,
  MM_PER_PT,
  type RectMm,
  SYMBOLOGY_BY_KIND,
  type TextLine,
  type TextMeasure,
  fitLines,
  labelText,
  planLabel,
} from './layouts';
import { listStocks } from './stocks';
import { encodeSymbol } from './symbols';

const CODES = { datamatrix: 'S26-00157B-*', code128: 'S26-00157B-*' } as const;

const inside = (inner: RectMm, outer: RectMm): boolean =>
  inner.x >= outer.x - 1e-9 &&
  inner.y >= outer.y - 1e-9 &&
  inner.x + inner.width <= outer.x + outer.width + 1e-9 &&
  inner.y + inner.height <= outer.y + outer.height + 1e-9;

const overlaps = (a: RectMm, b: RectMm): boolean =>
  a.x < b.x + b.width - 1e-9 && b.x < a.x + a.width - 1e-9 && a.y < b.y + b.height - 1e-9 && b.y < a.y + a.height - 1e-9;

const isMultiple = (value: number, step: number): boolean => Math.abs(value / step - Math.round(value / step)) < 1e-6;

describe('planLabel', () => {
  const cases = LABEL_KINDS.flatMap((kind) => listStocks().map((stock) => [kind, stock.key, stock] as const));

  it.each(cases)('%s on %s: symbol, quiet zone and text stay apart and inside the label', (kind, _key, stock) => {
    const symbology = SYMBOLOGY_BY_KIND[kind];
    const symbol = encodeSymbol(symbology, CODES[symbology]);
    const plan = planLabel(kind, stock, symbol);
    const inner: RectMm = {
      x: stock.paddingMm,
      y: stock.paddingMm,
      width: stock.labelWidthMm - 2 * stock.paddingMm,
      height: stock.labelHeightMm - 2 * stock.paddingMm,
    };
    const s = plan.symbol;
    expect(inside(s.withQuietZone, inner)).toBe(true);
    expect(inside(s.symbol, s.withQuietZone)).toBe(true);
    expect(overlaps(plan.headBox, s.withQuietZone)).toBe(false);
    if (plan.hriBox) expect(overlaps(plan.hriBox, s.withQuietZone)).toBe(false);
    // Whole printer dots per module, so no module prints a dot wider than its neighbours.
    expect(isMultiple(s.moduleMm, stock.dotMm)).toBe(true);

    if (symbology === 'datamatrix') {
      expect(s.moduleMm).toBeGreaterThanOrEqual(MIN_DATAMATRIX_MODULE_MM);
      expect(s.moduleMm).toBeLessThanOrEqual(MAX_DATAMATRIX_MODULE_MM);
      expect(s.moduleHeightMm).toBe(s.moduleMm);
      expect(s.symbol.x - s.withQuietZone.x).toBeCloseTo(1 * s.moduleMm, 9);
      expect(s.symbol.y - s.withQuietZone.y).toBeCloseTo(1 * s.moduleMm, 9);
      expect(s.symbol.width).toBeCloseTo(symbol.widthModules * s.moduleMm, 9);
    } else {
      expect(s.moduleMm).toBeGreaterThanOrEqual(MIN_CODE128_MODULE_MM);
      expect(s.moduleMm).toBeLessThanOrEqual(MAX_CODE128_MODULE_MM);
      expect(s.symbol.x - s.withQuietZone.x).toBeCloseTo(10 * s.moduleMm, 9);
      expect(s.moduleHeightMm).toBeGreaterThanOrEqual(Math.max(MIN_BAR_HEIGHT_MM, MIN_BAR_HEIGHT_RATIO * s.symbol.width) - 1e-9);
      expect(plan.hriBox).toBeDefined();
      expect(plan.hriBox?.y ?? 0).toBeGreaterThan(s.symbol.y + s.symbol.height);
    }
  });

  it('refuses a code whose Code 128 symbol would need bars thinner than 0.25 mm', () => {
    const stock = listStocks()[0];
    if (stock === undefined) throw new Error('no stock');
    const symbol = encodeSymbol('code128', 'C-ABCDEFGHIJKLMNOPQRSTUVWXYZ-*');
    expect(() => planLabel('container', stock, symbol)).toThrow(LabelError);
  });
});

// A stand-in for a monospace font: every character is 0.6 em wide.
const mono: TextMeasure = { widthMm: (text, _face, sizePt) => [...text].length * 0.6 * sizePt * MM_PER_PT };
const box: RectMm = { x: 10, y: 5, width: 25, height: 15 };
const line = (text: string, keep = false, scale = 1): TextLine => ({ text, face: 'regular', scale, keep });

describe('fitLines', () => {
  it('keeps every line inside the box, one under the other', () => {
    const placed = fitLines([line('S26-00157-K', true, 1.15), line('Heat H24-7731'), line('Order PO-2026-0042')], box, mono, {
      maxBasePt: 11,
      align: 'left',
    });
    expect(placed.length).toBe(3);
    for (const p of placed) {
      expect(mono.widthMm(p.text, p.face, p.sizePt)).toBeLessThanOrEqual(box.width + 1e-9);
      expect(p.xMm).toBe(box.x);
      expect(p.baselineMm).toBeGreaterThan(box.y);
      expect(p.baselineMm).toBeLessThan(box.y + box.height);
    }
    expect(placed.map((p) => p.baselineMm)).toEqual([...placed.map((p) => p.baselineMm)].sort((a, b) => a - b));
  });

  it('cuts a long free line with "…" but shrinks a code rather than cut it', () => {
    const long = 'Retained until the customer confirms the report, then disposed of in a signed batch';
    const code = 'S26-00157-K-EXTRA-LONG-CODE-1234';
    const [text, kept] = fitLines([line(long), line(code, true)], box, mono, { maxBasePt: 11, align: 'left' });
    expect(text?.text.endsWith('…')).toBe(true);
    expect(text?.sizePt).toBe(MIN_TEXT_PT);
    expect(mono.widthMm(text?.text ?? '', 'regular', text?.sizePt ?? 0)).toBeLessThanOrEqual(box.width);
    expect(kept?.text).toBe(code);
    expect(mono.widthMm(code, 'mono', kept?.sizePt ?? 0)).toBeLessThanOrEqual(box.width);
  });

  it('drops trailing free lines, never the code, when the box is too short for them all', () => {
    const small: RectMm = { x: 0, y: 0, width: 40, height: 5 };
    const placed = fitLines([line('S26-00157-K', true), line('one'), line('two'), line('three'), line('four')], small, mono, {
      maxBasePt: 11,
      align: 'center',
    });
    expect(placed[0]?.text).toBe('S26-00157-K');
    expect(placed.length).toBeLessThan(5);
    for (const p of placed) expect(p.sizePt).toBeGreaterThanOrEqual(MIN_TEXT_PT);
    const height = placed.reduce((h, p) => h + p.sizePt * 1.2 * MM_PER_PT, 0);
    expect(height).toBeLessThanOrEqual(small.height + 1e-9);
    // Centred: equal room left and right.
    const first = placed[0];
    if (first === undefined) throw new Error('no line');
    const w = mono.widthMm(first.text, first.face, first.sizePt);
    expect(first.xMm - small.x).toBeCloseTo(small.x + small.width - (first.xMm + w), 9);
  });
});

describe('labelText', () => {
  it('puts the code first in the monospace face on specimen and half labels', () => {
    const s = labelText('specimen', { code: 'S26-00158-*', heat: 'H24-7731', order: 'PO-2026-0042' });
    expect(s.head.map((l) => [l.text, l.face])).toEqual([
      ['S26-00158-*', 'mono'],
      ['Heat H24-7731', 'bold'],
      ['Order PO-2026-0042', 'regular'],
    ]);
    const h = labelText('half', { code: 'S26-00158B-*', specimenCode: 'S26-00158-*', heat: 'H24-7731', order: 'PO-2026-0042' });
    expect(h.head[0]?.text).toBe('S26-00158B-*');
    expect(h.head.some((l) => l.text === 'Half B of S26-00158-*')).toBe(true);
  });

  it('puts the code under the bars on bag, container and badge labels', () => {
    expect(labelText('bag', { code: 'C-00042-*', title: 'Retained halves', lines: ['Order PO-2026-0042', ''] })).toMatchObject({
      head: [{ text: 'Retained halves' }, { text: 'Order PO-2026-0042' }],
      hri: { text: 'C-00042-*', face: 'mono', keep: true },
    });
    expect(labelText('container', { code: 'C-00001-8', containerType: 'Box', name: 'Retained 2026-Q1' }).hri?.text).toBe('C-00001-8');
    expect(labelText('badge', { code: 'U-7KQ4M2-X', name: 'Ada Fenwick', role: 'Technician' }).head[0]?.text).toBe('Ada Fenwick');
  });
});
