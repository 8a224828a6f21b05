import { describe, expect, it } from 'vitest';
import { roundHalfEven } from '../decimal-rounding';
import { fromSI, toSI } from '../units';
import { TENSILE_PROPERTIES, computeTensile, type PropertyResult, type TensileProperty } from './compute';
import {
  SPECIFICATIONS,
  SpecificationInputSchema,
  getSpecification,
  judge,
  type JudgeableResults,
  type LimitProperty,
  type Specification,
  type SpecLimit,
} from './specifications';

function spec(key: string): Specification {
  const found = getSpecification(key);
  if (!found) throw new Error(`no specification ${key}`);
  return found;
}

/** Results with the given unrounded values (MPa, %); the rest not determined. */
function results(values: Partial<Record<TensileProperty, string>>, l0: string | null = null): JudgeableResults {
  const properties = Object.fromEntries(
    TENSILE_PROPERTIES.map((p): [TensileProperty, PropertyResult] => {
      const v = values[p];
      return [
        p,
        v === undefined
          ? { status: 'not-determined', code: 'no-record', reason: 'No force–extension record was given.' }
          : { status: 'determined', value: v, unrounded: v, unit: 'MPa', increment: '1', basis: 'test' },
      ];
    }),
  ) as Record<TensileProperty, PropertyResult>;
  return { properties, originalGaugeLengthMm: l0 };
}

function limits(s: Specification, property: LimitProperty): Pick<SpecLimit, 'min' | 'max'>[] {
  return s.limits.filter((l) => l.property === property).map(({ min, max }) => ({ ...(min ? { min } : {}), ...(max ? { max } : {}) }));
}

function verdictOf(s: Specification, r: JudgeableResults, property: LimitProperty, thicknessMm?: string) {
  const found = judge(s, r, { thicknessMm: thicknessMm ?? null }).properties.find((p) => p.property === property);
  if (!found) throw new Error(`no verdict on ${property}`);
  return found;
}

describe('the specification table', () => {
  it('holds the ASTM A36 limits in ksi and in MPa', () => {
    // ASTM A36/A36M tension requirements (CHECKS.md, read in a copy): TS 400–550 MPa [58–80 ksi],
    // yield ≥ 250 MPa [36 ksi], elongation ≥ 20 % in 200 mm [8 in], ≥ 23 % in 50 mm [2 in].
    const ksi = spec('astm-a36');
    const mpa = spec('astm-a36m');
    expect(ksi.strengthUnit).toBe('ksi');
    expect(limits(ksi, 'tensileStrength')).toEqual([{ min: '58', max: '80' }]);
    expect(limits(ksi, 'yieldStrength')).toEqual([{ min: '36' }]);
    expect(mpa.strengthUnit).toBe('MPa');
    expect(limits(mpa, 'tensileStrength')).toEqual([{ min: '400', max: '550' }]);
    expect(limits(mpa, 'yieldStrength')).toEqual([{ min: '250' }]);
    expect(mpa.limits.filter((l) => l.property === 'elongation').map((l) => [l.min, l.gaugeLength])).toEqual([
      ['20', { value: '200', unit: 'mm' }],
      ['23', { value: '50', unit: 'mm' }],
    ]);
    expect(ksi.limits.filter((l) => l.property === 'elongation').map((l) => [l.min, l.gaugeLength])).toEqual([
      ['20', { value: '8', unit: 'in' }],
      ['23', { value: '2', unit: 'in' }],
    ]);
  });

  it('holds the ASTM A572 Grade 50 [345] limits', () => {
    // ASTM A572/A572M Gr 50 (CHECKS.md, read in a copy): yield ≥ 345 MPa [50 ksi], TS ≥ 450 MPa
    // [65 ksi], elongation ≥ 18 % in 200 mm, ≥ 21 % in 50 mm.
    expect(limits(spec('astm-a572-gr50'), 'yieldStrength')).toEqual([{ min: '50' }]);
    expect(limits(spec('astm-a572-gr50'), 'tensileStrength')).toEqual([{ min: '65' }]);
    expect(limits(spec('astm-a572m-gr345'), 'yieldStrength')).toEqual([{ min: '345' }]);
    expect(limits(spec('astm-a572m-gr345'), 'tensileStrength')).toEqual([{ min: '450' }]);
    expect(limits(spec('astm-a572m-gr345'), 'elongation')).toEqual([{ min: '18' }, { min: '21' }]);
    expect(limits(spec('astm-a572-gr50'), 'elongation')).toEqual([{ min: '18' }, { min: '21' }]);
  });

  it('holds the EN 10025-2 S355JR limits', () => {
    // EN 10025-2 S355JR (CHECKS.md, read in a copy): Rm 470–630 MPa; ReH by thickness below.
    expect(limits(spec('en10025-2-s355jr'), 'tensileStrength')).toEqual([{ min: '470', max: '630' }]);
    expect(limits(spec('en10025-2-s355jr'), 'yieldStrength').map((l) => l.min)).toEqual(['355', '345', '335', '325', '315', '295']);
  });

  it('holds the ASTM B209 6061-T6 limits for 0.021–0.499 in', () => {
    // ASTM B209 6061-T6 (CHECKS.md, read in a copy): TS ≥ 42.0 ksi, YS ≥ 35.0 ksi, elongation ≥ 10 %
    // for 0.021–0.499 in.
    const b209 = spec('astm-b209-6061-t6');
    expect(b209.strengthUnit).toBe('ksi');
    expect(b209.yieldMeasure).toBe('offset');
    expect(limits(b209, 'tensileStrength')).toEqual([{ min: '42.0' }]);
    expect(limits(b209, 'yieldStrength')).toEqual([{ min: '35.0' }]);
    expect(limits(b209, 'elongation')).toEqual([{ min: '10' }]);
    expect(b209.limits.every((l) => l.thickness?.from === '0.021' && l.thickness.upTo === '0.499' && l.thickness.unit === 'in')).toBe(true);
  });

  it('names a source for every row, and every row passes the form’s own schema', () => {
    for (const s of SPECIFICATIONS) {
      expect(s.source.length).toBeGreaterThan(10);
      expect(SpecificationInputSchema.safeParse(s).success).toBe(true);
    }
    expect(new Set(SPECIFICATIONS.map((s) => s.key)).size).toBe(SPECIFICATIONS.length);
  });
});

describe('judge', () => {
  it('applies the S355JR ReH thickness bands: ≤16 355, ≤40 345, ≤63 335, ≤80 325, ≤100 315, above 295', () => {
    // EN 10025-2 (CHECKS.md, read in a copy): ReH ≥ 355 MPa up to 16 mm, 345 to 40, 335 to 63,
    // 325 to 80, 315 to 100, 295 above; each band includes its upper bound.
    const s355 = spec('en10025-2-s355jr');
    const r = results({ upperYieldStrength: '400', tensileStrength: '500' });
    const cases: [string, string][] = [
      ['8', '355'], ['16', '355'], ['16.01', '345'], ['40', '345'], ['40.5', '335'], ['63', '335'],
      ['64', '325'], ['80', '325'], ['81', '315'], ['100', '315'], ['100.1', '295'], ['150', '295'],
    ];
    for (const [thickness, min] of cases) {
      expect(verdictOf(s355, r, 'yieldStrength', thickness).limit).toBe(`≥ ${min} MPa`);
    }
  });

  it('judges S355JR at the band edges by the rounded result', () => {
    // A 20 mm plate needs ReH ≥ 345 MPa; 344.4 rounds to 344 (below), 344.5 to 344 (exact half,
    // even neighbour; ASTM E29 rule), 344.6 to 345 (meets).
    const s355 = spec('en10025-2-s355jr');
    expect(verdictOf(s355, results({ upperYieldStrength: '344.4' }), 'yieldStrength', '20').verdict).toBe('does-not-conform');
    expect(verdictOf(s355, results({ upperYieldStrength: '344.5' }), 'yieldStrength', '20').verdict).toBe('does-not-conform');
    expect(verdictOf(s355, results({ upperYieldStrength: '344.6' }), 'yieldStrength', '20')).toMatchObject({
      verdict: 'conforms',
      observed: '345 MPa',
      result: 'ReH',
    });
    // Without a yield drop the offset yield stands in.
    expect(verdictOf(s355, results({ offsetYieldStrength: '350' }), 'yieldStrength', '20')).toMatchObject({ verdict: 'conforms', result: 'Rp0.2' });
  });

  it('cannot judge a thickness-banded limit without the thickness, or outside the bands', () => {
    const s355 = spec('en10025-2-s355jr');
    const r = results({ upperYieldStrength: '400', tensileStrength: '500' });
    const noThickness = judge(s355, r);
    expect(noThickness.verdict).toBe('cannot-judge');
    expect(noThickness.properties[0]?.message).toMatch(/no nominal thickness was given/);
    // The Rm row covers 3–100 mm only (band recalled, not read).
    const thin = verdictOf(s355, r, 'tensileStrength', '2');
    expect(thin.verdict).toBe('cannot-judge');
    expect(thin.message).toMatch(/no limit for a nominal thickness of 2 mm \(it covers from 3 up to 100 mm\)/);
    expect(judge(s355, r, { thicknessMm: '12' }).verdict).toBe('conforms');
  });

  it('compares ksi limits in ksi and MPa limits in MPa', () => {
    // 1 ksi = 6.894757 MPa (NIST SP 811, from the exact lbf and inch). 36 ksi = 248.2 MPa, but
    // A36M's own limit is 250 MPa (CHECKS.md). A yield of 247 MPa is 35.82 ksi, which rounds to
    // 36 ksi (nearest 1 ksi) and meets A36; in MPa it rounds to 245 (nearest 5 MPa) and fails A36M.
    expect(roundHalfEven(toSI('36', 'ksi'), 1)).toBe('248.2');
    expect(roundHalfEven(fromSI('247', 'ksi'), 2)).toBe('35.82');
    const r = results({ offsetYieldStrength: '247', tensileStrength: '450' });
    expect(verdictOf(spec('astm-a36'), r, 'yieldStrength')).toMatchObject({ verdict: 'conforms', observed: '36 ksi', limit: '≥ 36 ksi' });
    expect(verdictOf(spec('astm-a36m'), r, 'yieldStrength')).toMatchObject({ verdict: 'does-not-conform', observed: '245 MPa', limit: '≥ 250 MPa' });
    expect(verdictOf(spec('astm-a36'), r, 'yieldStrength').message).toBe('Yield strength (Rp0.2) 36 ksi meets ≥ 36 ksi.');
  });

  it('judges B209 6061-T6 in ksi to 0.1 ksi, within its thickness row only', () => {
    // 42.0 ksi = 289.58 MPa. 289.5 MPa = 41.988 ksi → 42.0 (meets); 289.0 MPa = 41.916 → 41.9 (below).
    const b209 = spec('astm-b209-6061-t6');
    const sheet = '6.35'; // 0.250 in
    expect(verdictOf(b209, results({ tensileStrength: '289.5' }), 'tensileStrength', sheet)).toMatchObject({ verdict: 'conforms', observed: '42.0 ksi' });
    expect(verdictOf(b209, results({ tensileStrength: '289.0' }), 'tensileStrength', sheet)).toMatchObject({ verdict: 'does-not-conform', observed: '41.9 ksi' });
    // The thickness is placed after rounding to 0.001 in: 12.68 mm = 0.49921 in → 0.499 (in the row);
    // 12.7 mm = 0.500 in and 0.508 mm = 0.020 in are outside it.
    expect(verdictOf(b209, results({ tensileStrength: '300' }), 'tensileStrength', '12.68').verdict).toBe('conforms');
    expect(verdictOf(b209, results({ tensileStrength: '300' }), 'tensileStrength', '12.7').verdict).toBe('cannot-judge');
    expect(verdictOf(b209, results({ tensileStrength: '300' }), 'tensileStrength', '0.508').verdict).toBe('cannot-judge');
    // B209 limits the offset yield strength even where the curve shows a yield drop.
    expect(verdictOf(b209, results({ upperYieldStrength: '300', offsetYieldStrength: '240' }), 'yieldStrength', sheet)).toMatchObject({
      result: 'Rp0.2',
      observed: '34.8 ksi',
      verdict: 'does-not-conform',
    });
  });

  it('picks the elongation limit by the specimen’s gauge length', () => {
    // A36: ≥ 23 % in 2 in [50 mm], ≥ 20 % in 8 in [200 mm]. A 50 mm gauge length counts as 2 in.
    // A = 22.5 % rounds to 22 % (nearest 1 %, exact half to even) and misses 23 %.
    const a36 = spec('astm-a36');
    expect(verdictOf(a36, results({ elongation: '22.5' }, '50'), 'elongation')).toMatchObject({ verdict: 'does-not-conform', limit: '≥ 23 %', observed: '22 %' });
    expect(verdictOf(a36, results({ elongation: '22.5' }, '200'), 'elongation')).toMatchObject({ verdict: 'conforms', limit: '≥ 20 %' });
    expect(verdictOf(spec('astm-a36m'), results({ elongation: '23.6' }, '50.8'), 'elongation')).toMatchObject({ verdict: 'conforms', limit: '≥ 23 %' });
    const proportional = verdictOf(a36, results({ elongation: '25' }, '62.59'), 'elongation');
    expect(proportional.verdict).toBe('cannot-judge');
    expect(proportional.message).toMatch(/gauge lengths of 8 in and 2 in, and this specimen's L0 is 62.59 mm/);
    expect(verdictOf(a36, results({ elongation: '25' }), 'elongation').message).toMatch(/no original gauge length L0/);
  });

  it('says why a property cannot be judged when its result is missing', () => {
    const v = verdictOf(spec('astm-a572m-gr345'), results({ tensileStrength: '500' }), 'yieldStrength');
    expect(v.verdict).toBe('cannot-judge');
    expect(v.message).toBe('Yield strength cannot be judged: Rp0.2 was not determined. No force–extension record was given.');
  });

  it('gives the specimen verdict: any failure, else any open question, else conforms', () => {
    const a572 = spec('astm-a572m-gr345');
    const good = results({ tensileStrength: '500', offsetYieldStrength: '360', elongation: '25' }, '50');
    expect(judge(a572, good)).toMatchObject({ verdict: 'conforms', summary: 'Conforms to ASTM A572/A572M Grade 345 (SI limits).' });
    const open = results({ tensileStrength: '500', offsetYieldStrength: '360' }, '50');
    expect(judge(a572, open).verdict).toBe('cannot-judge');
    const bad = results({ tensileStrength: '440', offsetYieldStrength: '360' }, '50');
    const verdict = judge(a572, bad);
    expect(verdict.verdict).toBe('does-not-conform');
    expect(verdict.summary).toBe(
      'Does not conform to ASTM A572/A572M Grade 345 (SI limits): Tensile strength (Rm) 440 MPa is below the minimum 450 MPa.',
    );
  });

  it('judges what computeTensile produces', () => {
    // Flat 12.5 × 2 mm sheet, Fm 11 250 N → Rm 450 MPa; A 22.5 % on 50 mm.
    const computed = computeTensile({ s0Mm2: '25', maxForceN: '11250', originalGaugeLengthMm: '50', finalGaugeLengthMm: '61.25' });
    const verdict = judge(spec('astm-a36m'), computed);
    expect(verdict.properties.map((p) => [p.property, p.verdict])).toEqual([
      ['tensileStrength', 'conforms'],
      ['yieldStrength', 'cannot-judge'],
      ['elongation', 'does-not-conform'],
    ]);
  });
});

describe('SpecificationInputSchema', () => {
  const valid = {
    key: 'en10025-2-s275jr',
    designation: 'EN 10025-2',
    grade: 'S275JR',
    strengthUnit: 'MPa',
    yieldMeasure: 'upper-or-offset',
    source: 'EN 10025-2, table of mechanical properties (the lab’s copy)',
    limits: [
      { property: 'yieldStrength', min: '275', thickness: { unit: 'mm', upTo: '16' }, comparisonIncrement: '1' },
      { property: 'yieldStrength', min: '265', thickness: { unit: 'mm', over: '16', upTo: '40' }, comparisonIncrement: '1' },
      { property: 'tensileStrength', min: '410', max: '560', comparisonIncrement: '1' },
    ],
  };

  function messages(input: unknown): string[] {
    const parsed = SpecificationInputSchema.safeParse(input);
    return parsed.success ? [] : parsed.error.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
  }

  it('accepts a well-formed specification', () => {
    expect(messages(valid)).toEqual([]);
  });

  it('refuses limits that cannot be right, with messages beside the fields', () => {
    const limit = (l: object) => ({ ...valid, limits: [l] });
    expect(messages(limit({ property: 'tensileStrength', comparisonIncrement: '1' }))).toEqual(['limits.0.min: Give a minimum, a maximum, or both.']);
    expect(messages(limit({ property: 'tensileStrength', min: '600', max: '500', comparisonIncrement: '1' }))).toEqual([
      'limits.0.max: The maximum must not be below the minimum.',
    ]);
    expect(messages(limit({ property: 'elongation', min: '120', comparisonIncrement: '1' }))).toEqual(['limits.0.min: A percentage cannot be above 100.']);
    expect(messages(limit({ property: 'tensileStrength', min: '400', gaugeLength: { value: '50', unit: 'mm' }, comparisonIncrement: '1' }))).toEqual([
      'limits.0.gaugeLength: Only an elongation limit names a gauge length.',
    ]);
    expect(messages(limit({ property: 'tensileStrength', min: '4,5', comparisonIncrement: '0' }))).toHaveLength(2);
  });

  it('refuses overlapping thickness bands for the same property', () => {
    const overlapping = {
      ...valid,
      limits: [
        { property: 'yieldStrength', min: '275', thickness: { unit: 'mm', upTo: '16' }, comparisonIncrement: '1' },
        { property: 'yieldStrength', min: '265', thickness: { unit: 'mm', from: '16', upTo: '40' }, comparisonIncrement: '1' },
      ],
    };
    expect(messages(overlapping)).toEqual(['limits.1.thickness: This yield strength limit overlaps limit 1; give each thickness band once.']);
    const inches = {
      ...valid,
      limits: [
        { property: 'yieldStrength', min: '35', thickness: { unit: 'in', from: '0.021', upTo: '0.499' }, comparisonIncrement: '1' },
        { property: 'yieldStrength', min: '35', thickness: { unit: 'mm', from: '12', upTo: '25' }, comparisonIncrement: '1' },
      ],
    };
    // 0.499 in = 12.6746 mm, which reaches into 12–25 mm.
    expect(messages(inches)).toHaveLength(1);
  });

  it('refuses a key that is not lower-case with hyphens, and a missing source', () => {
    expect(messages({ ...valid, key: 'S275 JR' })[0]).toMatch(/^key: Use lower-case letters/);
    expect(messages({ ...valid, source: '' })[0]).toMatch(/^source: Say where the limits were read/);
  });
});
