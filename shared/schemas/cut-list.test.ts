import { describe, expect, it } from 'vitest';
import { checkCutListHeader, parseThickness, readCutListRow } from './cut-list';

describe('parseThickness', () => {
  it('converts inches exactly: 1 in = 25.4 mm (NIST SP 811)', () => {
    expect(parseThickness('1 in')).toEqual({ ok: true, mm: '25.4' });
    expect(parseThickness('0.25in')).toEqual({ ok: true, mm: '6.35' });
    expect(parseThickness('0.375"')).toEqual({ ok: true, mm: '9.525' });
  });

  it('keeps millimetres as written and rounds beyond 0.001 mm', () => {
    expect(parseThickness('6.35 mm')).toEqual({ ok: true, mm: '6.35' });
    expect(parseThickness('12 MM')).toEqual({ ok: true, mm: '12' });
    // 0.0625 in = 1.5875 mm exactly; stored to three decimals, half to even gives 1.588 (ASTM E29 rule).
    expect(parseThickness('0.0625 in')).toEqual({ ok: true, mm: '1.588' });
  });

  it('reads an empty cell as not given', () => {
    expect(parseThickness('  ')).toEqual({ ok: true, mm: null });
  });

  it('refuses a unit it cannot read, a missing unit, zero and text', () => {
    expect(parseThickness('5 cm')).toMatchObject({ ok: false, message: expect.stringContaining('"cm" is not one Halfmark reads') });
    expect(parseThickness('6')).toMatchObject({ ok: false, message: expect.stringContaining('no unit') });
    expect(parseThickness('0 mm')).toMatchObject({ ok: false });
    expect(parseThickness('thick')).toMatchObject({ ok: false });
    expect(parseThickness('6,35 mm')).toMatchObject({ ok: false });
  });
});

describe('checkCutListHeader', () => {
  it('accepts the columns in any order and case, with or without thickness', () => {
    expect(checkCutListHeader(['Geometry', 'heat_number', ' position ', 'orientation', 'specimens'])).toEqual([]);
    expect(checkCutListHeader(['heat_number', 'position', 'orientation', 'specimens', 'geometry', 'thickness'])).toEqual([]);
  });

  it('names missing, unknown and repeated columns', () => {
    const problems = checkCutListHeader(['heat', 'position', 'position', 'orientation', 'specimens', 'geometry']).join(' ');
    expect(problems).toContain('lacks "heat_number"');
    expect(problems).toContain('does not read: "heat"');
    expect(problems).toContain('"position" twice');
  });
});

describe('readCutListRow', () => {
  it('reads a good row', () => {
    const { row, errors } = readCutListRow({ heat_number: 'H1', position: 'head', orientation: 'longitudinal', specimens: '2', geometry: 'astm-e8-flat-sheet-12.5', thickness: '0.5 in' }, 2);
    expect(errors).toEqual([]);
    expect(row).toEqual({ line: 2, heatNumber: 'H1', position: 'head', orientation: 'longitudinal', specimens: 2, geometryKey: 'astm-e8-flat-sheet-12.5', thicknessMm: '12.7' });
  });

  it('refuses a thickness above the geometry’s limit: sheet-type T ≤ 19 mm (ASTM E8/E8M Fig. 1, CHECKS.md [copy])', () => {
    const { errors } = readCutListRow({ heat_number: 'H1', position: 'head', orientation: 'L', specimens: '1', geometry: 'astm-e8-flat-sheet-12.5', thickness: '0.8 in' }, 3);
    expect(errors).toEqual([{ column: 'thickness', message: expect.stringContaining('20.32 mm is thicker than') }]);
  });
});
