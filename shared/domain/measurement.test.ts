import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import {
  AREA_POLICIES,
  AreaPolicySchema,
  MeasurementPayloadSchema,
  checkReading,
  checkReadings,
  crossSectionArea,
  engineeringStress,
  forceFromStress,
  proportionalGaugeLength,
  readingProblem,
  type FlatReadings,
} from './measurement';
import { getGeometry, type SpecimenGeometry } from './specimen-geometries';

function geometry(key: string): SpecimenGeometry {
  const g = getGeometry(key);
  if (!g) throw new Error(`no geometry ${key}`);
  return g;
}

// Worked arithmetic from the project's check values, reproduced independently with decimal.js [run].
const worked: FlatReadings = {
  shape: 'flat',
  width: ['12.52', '12.47', '12.50'],
  thickness: ['1.99', '2.02', '2.00'],
};
const FM = '11250';

describe('crossSectionArea, flat', () => {
  it('defaults to minimum width × minimum thickness (common practice in labs)', () => {
    const s = crossSectionArea(worked);
    expect(s.policy).toBe('min-dimensions');
    // 12.47 × 1.99 = 24.8153 mm²; 11 250 N / 24.8153 mm² = 453.35 MPa [run].
    expect(s.area).toBe('24.8153');
    expect(engineeringStress(FM, s.area)).toBe('453.35');
    expect(s.basis).toBe('minimum width 12.47 mm × minimum thickness 1.99 mm');
  });

  it('takes the least of the measured sections', () => {
    const s = crossSectionArea(worked, 'least-section');
    // Sections 24.9148, 25.1894, 25.0000 mm²; least 24.9148 mm² → 451.54 MPa [run].
    expect(s.sections).toEqual(['24.9148', '25.1894', '25.0000']);
    expect(s.area).toBe('24.9148');
    expect(engineeringStress(FM, s.area)).toBe('451.54');
    expect(s.basis).toContain('reading 1: 12.52 mm × 1.99 mm');
  });

  it('takes the mean of the measured sections', () => {
    const s = crossSectionArea(worked, 'mean-section');
    // (24.9148 + 25.1894 + 25.0000) / 3 = 25.0347 mm² → 449.38 MPa [run].
    expect(s.area).toBe('25.0347');
    expect(s.areaUnrounded.startsWith('25.03473333')).toBe(true);
    expect(engineeringStress(FM, s.area)).toBe('449.38');
    expect(engineeringStress(FM, s.areaUnrounded)).toBe('449.38');
  });

  it('never lets min-dimensions exceed least-section, nor least-section exceed the mean', () => {
    const reading = fc.integer({ min: 100, max: 50_000 }).map((n) => new Decimal(n).div(1000).toFixed(3));
    fc.assert(
      fc.property(fc.array(fc.tuple(reading, reading), { minLength: 1, maxLength: 5 }), (pairs) => {
        const r: FlatReadings = { shape: 'flat', width: pairs.map((p) => p[0]), thickness: pairs.map((p) => p[1]) };
        const [minDims, least, mean] = AREA_POLICIES.map((p) => new Decimal(crossSectionArea(r, p).areaUnrounded));
        expect(minDims?.lte(least ?? 0)).toBe(true);
        expect(least?.lte(mean ?? 0)).toBe(true);
      }),
    );
  });

  it('refuses bad readings', () => {
    expect(() => crossSectionArea({ shape: 'flat', width: ['12.5'], thickness: ['2', '2'] })).toThrow(/same number/);
    expect(() => crossSectionArea({ shape: 'flat', width: ['0'], thickness: ['2'] })).toThrow(/greater than zero/);
    expect(() => crossSectionArea({ shape: 'flat', width: ['12,5'], thickness: ['2'] })).toThrow(/decimal point/);
    expect(() => crossSectionArea({ shape: 'round', diameter: [] })).toThrow(/at least one/);
  });
});

describe('crossSectionArea, round', () => {
  it('reproduces the Callister brass example', () => {
    // Callister, Materials Science and Engineering: An Introduction, example problem on a brass
    // specimen [copy]: d0 = 12.8 mm and TS = 450 MPa give Fmax ≈ 57 900 N (57 905.8 exact).
    const s = crossSectionArea({ shape: 'round', diameter: ['12.8'] });
    expect(s.area).toBe('128.6796');
    expect(forceFromStress('450', s.areaUnrounded)).toBe('57905.8');
    expect(forceFromStress('450', s.area)).toBe('57905.8');
  });

  it('uses the minimum diameter, or the mean of the sections', () => {
    const r = { shape: 'round', diameter: ['12.52', '12.48', '12.50'] } as const;
    const min = crossSectionArea(r);
    // π × 12.48² / 4 = 122.32608… mm²; cross-checked with binary floating point, which is
    // accurate enough here as the value is nowhere near a rounding tie.
    expect((Math.PI * 12.48 ** 2) / 4).toBeCloseTo(122.32608, 5);
    expect(min.area).toBe('122.3261');
    expect(crossSectionArea(r, 'least-section').area).toBe(min.area);
    const mean = crossSectionArea(r, 'mean-section');
    expect(mean.area).toBe(
      new Decimal(Math.PI).mul(['12.52', '12.48', '12.50'].reduce((a, d) => a + Number(d) ** 2, 0) / 12).toFixed(4),
    );
    expect(min.basis).toBe('π·d²/4 with the minimum diameter 12.48 mm');
  });
});

describe('proportionalGaugeLength (ISO 6892-1, L0 = 5.65·√S0)', () => {
  it('gives 62.59 mm for a 12.5 mm round and 28.25 mm for 12.5 × 2 mm flat', () => {
    // Check values [run]: d = 12.5 mm → S0 = 122.7185 mm², L0 = 62.59 mm (≈ 5d); 12.5 × 2 mm → 28.25 mm.
    const s0 = crossSectionArea({ shape: 'round', diameter: ['12.5'] }).area;
    expect(s0).toBe('122.7185');
    expect(proportionalGaugeLength(s0)).toBe('62.59');
    const flat = crossSectionArea({ shape: 'flat', width: ['12.5'], thickness: ['2'] }).area;
    expect(proportionalGaugeLength(flat)).toBe('28.25');
    // k = 11.3 for long specimens (ISO 6892-1, from memory): 11.3 × 5 = 56.50.
    expect(proportionalGaugeLength('25', { coefficient: '11.3' })).toBe('56.50');
    expect(() => proportionalGaugeLength('0')).toThrow(RangeError);
  });
});

describe('checkReading and checkReadings', () => {
  it('counts the tolerance limits as within', () => {
    expect(checkReading('12.7', '12.5', '0.2')).toBe('within');
    expect(checkReading('12.3', '12.5', '0.2')).toBe('within');
    expect(checkReading('12.71', '12.5', '0.2')).toBe('above');
    expect(checkReading('12.29', '12.5', '0.2')).toBe('below');
  });

  it('lists each out-of-tolerance reading of a flat specimen', () => {
    // Sheet-type 12.5 mm: W 12.5 ± 0.2 mm, T ≤ 19 mm (ASTM E8/E8M Fig. 1) [copy].
    const sheet = geometry('astm-e8-flat-sheet-12.5');
    expect(checkReadings(sheet, worked)).toEqual([]);
    const issues = checkReadings(sheet, {
      shape: 'flat',
      width: ['12.75', '12.50', '12.28'],
      thickness: ['19.0', '19.2', '2.00'],
    });
    expect(issues.map((i) => [i.dimension, i.index, i.status])).toEqual([
      ['width', 0, 'above'],
      ['width', 2, 'below'],
      ['thickness', 1, 'above'],
    ]);
    expect(issues[0]?.message).toBe('Width reading 1 (12.75 mm) is above 12.5 ± 0.2 mm.');
    expect(issues[2]?.message).toBe('Thickness reading 2 (19.2 mm) is above the 19 mm maximum.');
  });

  it('checks diameters of a round specimen', () => {
    // Round 9 mm: D 9.0 ± 0.1 mm (ASTM E8/E8M Fig. 8) [copy].
    const issues = checkReadings(geometry('astm-e8m-round-9-5d'), { shape: 'round', diameter: ['9.05', '8.88', '9.10'] });
    expect(issues).toHaveLength(1);
    expect(issues[0]).toMatchObject({ dimension: 'diameter', index: 1, status: 'below', allowed: '9.0 ± 0.1 mm' });
  });

  it('refuses readings of the wrong shape', () => {
    expect(() => checkReadings(geometry('astm-e8-round-12.5-4d'), worked)).toThrow(/round geometry but the readings are flat/);
  });
});

describe('MeasurementPayloadSchema', () => {
  it('accepts three readings per dimension and an optional reason', () => {
    expect(MeasurementPayloadSchema.parse({ ...worked })).toEqual(worked);
    expect(
      MeasurementPayloadSchema.parse({
        shape: 'round',
        diameter: [' 12.50', '12.49', '12.51 '],
        outOfToleranceReason: '  Customer asked for the test anyway. ',
      }),
    ).toEqual({
      shape: 'round',
      diameter: ['12.50', '12.49', '12.51'],
      outOfToleranceReason: 'Customer asked for the test anyway.',
    });
  });

  it('explains what is wrong with a reading', () => {
    const messages = (payload: unknown) =>
      MeasurementPayloadSchema.safeParse(payload).error?.issues.map((i) => `${i.path.join('.')}: ${i.message}`);
    expect(messages({ shape: 'flat', width: ['12.52', '12,47', '-1'], thickness: ['1.99', '0', 'abc'] })).toEqual([
      'width.1: Use a decimal point, not a comma: 12.47.',
      'width.2: Enter the reading as a number of millimetres, such as 12.52.',
      'thickness.1: A reading must be greater than zero.',
      'thickness.2: Enter the reading as a number of millimetres, such as 12.52.',
    ]);
    expect(messages({ shape: 'round', diameter: ['12.5', '12.5'] })).toEqual(['diameter: Enter three diameter readings.']);
    expect(messages({ shape: 'round', diameter: [12.5, '12.5', '12.5'] })).toEqual([
      'diameter.0: Enter the reading as a number of millimetres, such as 12.52.',
    ]);
    expect(messages({ shape: 'square' })).toEqual(['shape: Say whether the specimen is flat or round.']);
    expect(messages({ ...worked, outOfToleranceReason: '   ' })).toEqual([
      'outOfToleranceReason: Say why the specimen is used although a reading is out of tolerance.',
    ]);
  });

  it('agrees with readingProblem', () => {
    expect(readingProblem('12.52')).toBeNull();
    expect(readingProblem('')).toBe('Enter a reading.');
    expect(readingProblem('1e3')).toMatch(/such as 12.52/);
    expect(AreaPolicySchema.parse('least-section')).toBe('least-section');
    expect(AreaPolicySchema.safeParse('max').error?.issues[0]?.message).toBe('Choose an area policy from the list.');
  });
});
