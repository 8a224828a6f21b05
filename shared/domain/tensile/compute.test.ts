import { describe, expect, it } from 'vitest';
import { crossSectionArea, proportionalGaugeLength } from '../measurement';
import { roundHalfEven } from '../decimal-rounding';
import type { ForcePoint } from './raw-record';
import {
  EXPECTED_MODULUS_MPA,
  ISO_6892_1_ROUNDING,
  analyseCurve,
  computeTensile,
  elongationAfterFracture,
  reductionOfArea,
  stressStrain,
  tensileStrength,
  thinForDisplay,
  thinIndices,
  type PropertyResult,
  type TensileResults,
} from './compute';

function value(result: PropertyResult): string {
  if (result.status !== 'determined') throw new Error(`not determined: ${result.reason}`);
  return result.value;
}

function unrounded(result: PropertyResult): number {
  if (result.status !== 'determined') throw new Error(`not determined: ${result.reason}`);
  return Number(result.unrounded);
}

function codes(results: TensileResults): string[] {
  return results.errors.map((e) => e.code);
}

/** A curve given as stress (MPa) per strain, turned into force and extension for S0 and Le. */
function record(curve: readonly { strain: number; stress: number }[], s0 = 100, le = 50): ForcePoint[] {
  return curve.map(({ strain, stress }) => ({ forceN: stress * s0, extensionMm: strain * le }));
}

/**
 * Elastic–linear-hardening curve: E = 200 GPa up to yield at 250 MPa (strain 0.00125), then a
 * hardening modulus of 2 GPa up to strain 0.15 (547.5 MPa), then a linear fall to 450 MPa at 0.18
 * (necking). Points every 0.000025 strain elastically, every 0.0001 after. Strains are built from
 * whole-number steps so the yield kink is itself a point.
 */
function linearHardening(options: { noise?: number; toe?: number } = {}): { strain: number; stress: number }[] {
  const out: { strain: number; stress: number }[] = [];
  for (let k = 0; k <= 50; k++) out.push({ strain: k * 0.000025, stress: 200_000 * k * 0.000025 });
  for (let k = 13; k <= 1500; k++) {
    const strain = k / 10_000;
    out.push({ strain, stress: 250 + 2000 * (strain - 0.00125) });
  }
  // The maximum, exactly: 250 + 2000 × (0.15 − 0.00125) = 547.5 MPa.
  const peak = out[out.length - 1];
  if (peak) peak.stress = 547.5;
  for (let k = 1; k <= 60; k++) out.push({ strain: 0.15 + k * 0.0005, stress: 547.5 - (97.5 * k) / 60 });
  const { noise = 0, toe = 0 } = options;
  return out.map(({ strain, stress }, i) => ({
    strain: strain + toe,
    // Deterministic noise, never on the maximum so Fm stays exact.
    stress: stress === 547.5 ? stress : stress + noise * Math.sin(i * 1.7),
  }));
}

describe('tensileStrength, elongationAfterFracture, reductionOfArea', () => {
  it('reproduces the handbook example: Fmax for a 12.8 mm brass bar at 450 MPa', () => {
    // Callister, Materials Science and Engineering: An Introduction, example problem on a brass
    // specimen (read in a secondary copy): d0 = 12.8 mm, TS 450 MPa give Fmax ≈ 57 900 N
    // (57 905.8 N unrounded to one place).
    const area = crossSectionArea({ shape: 'round', diameter: ['12.8'] }).areaUnrounded;
    const fm = tensileStrength('1', area).pow(-1).mul(450);
    expect(roundHalfEven(fm, 1)).toBe('57905.8');
    expect(roundHalfEven(tensileStrength('57905.8', area), 0)).toBe('450');
  });

  it('gives Rm for each of the three area policies of the worked example', () => {
    // CHECKS.md worked arithmetic (reproduced with decimal.js): widths 12.52, 12.47, 12.50 mm,
    // thicknesses 1.99, 2.02, 2.00 mm, Fm = 11 250 N.
    const readings = { shape: 'flat', width: ['12.52', '12.47', '12.50'], thickness: ['1.99', '2.02', '2.00'] } as const;
    const expected = { 'least-section': ['24.9148', '451.54'], 'min-dimensions': ['24.8153', '453.35'], 'mean-section': ['25.0347', '449.38'] } as const;
    for (const [policy, [area, rm]] of Object.entries(expected)) {
      const section = crossSectionArea(readings, policy as keyof typeof expected);
      expect(section.area).toBe(area);
      expect(roundHalfEven(tensileStrength('11250', section.area), 2)).toBe(rm);
      const results = computeTensile({ s0Mm2: section.area, maxForceN: '11250' });
      // ISO 6892-1 rounds strength to 1 MPa [from memory]: 451.54 → 452, 453.35 → 453, 449.38 → 449.
      expect(value(results.properties.tensileStrength)).toBe(roundHalfEven(rm, 0));
    }
  });

  it('computes A = (Lu − L0)/L0 × 100 and Z = (S0 − Su)/S0 × 100', () => {
    // CHECKS.md (formulae per ISO 6892-1; clause numbers from memory): L0 50.00 → Lu 61.25 mm
    // gives 22.5 %; a round bar d 12.50 → du 7.50 mm gives Z = 64.0 %.
    expect(elongationAfterFracture('50.00', '61.25').toString()).toBe('22.5');
    const s0 = crossSectionArea({ shape: 'round', diameter: ['12.50'] }).areaUnrounded;
    const su = crossSectionArea({ shape: 'round', diameter: ['7.50'] }).areaUnrounded;
    expect(roundHalfEven(reductionOfArea(s0, su), 1)).toBe('64.0');
    const results = computeTensile({ s0Mm2: s0, originalGaugeLengthMm: '50.00', finalGaugeLengthMm: '61.25', finalAreaMm2: su });
    // ISO 6892-1 rounds A and Z to 0.5 % [from memory].
    expect(value(results.properties.elongation)).toBe('22.5');
    expect(value(results.properties.reductionOfArea)).toBe('64.0');
  });

  it('rounds A on the proportional gauge length L0 = 5.65·√S0', () => {
    // ISO 6892-1 proportional gauge length (CHECKS.md, reproduced): d = 12.5 mm → S0 = 122.7185
    // mm², L0 = 62.59 mm; flat 12.5 × 2 mm → L0 = 28.25 mm.
    const round = crossSectionArea({ shape: 'round', diameter: ['12.5'] }).area;
    expect(round).toBe('122.7185');
    expect(proportionalGaugeLength(round)).toBe('62.59');
    expect(proportionalGaugeLength('25')).toBe('28.25');
    // (76.82 − 62.59)/62.59 = 22.735… % → 22.5 % in 0.5 % steps.
    const results = computeTensile({ s0Mm2: round, originalGaugeLengthMm: '62.59', finalGaugeLengthMm: '76.82' });
    expect(value(results.properties.elongation)).toBe('22.5');
    expect(results.originalGaugeLengthMm).toBe('62.59');
  });

  it('rounds exact halves to the even step (ASTM E29) on decimals', () => {
    // ASTM E29 rounding method (read in a secondary copy): an exact half goes to the even digit.
    // Rm = 45 150 N / 100 mm² = 451.5 → 452; 45 250 / 100 = 452.5 → 452. A: 22.25 % → 22.0 (even
    // multiple of 0.5), 22.75 % → 23.0.
    expect(value(computeTensile({ s0Mm2: '100', maxForceN: '45150' }).properties.tensileStrength)).toBe('452');
    expect(value(computeTensile({ s0Mm2: '100', maxForceN: '45250' }).properties.tensileStrength)).toBe('452');
    expect(value(computeTensile({ originalGaugeLengthMm: '100', finalGaugeLengthMm: '122.25' }).properties.elongation)).toBe('22.0');
    expect(value(computeTensile({ originalGaugeLengthMm: '100', finalGaugeLengthMm: '122.75' }).properties.elongation)).toBe('23.0');
    expect(ISO_6892_1_ROUNDING).toEqual({ strength: '1', yieldPointElongation: '0.1', elongation: '0.5', reductionOfArea: '0.5' });
  });

  it('rounds the ASTM E29 examples on the reported path', () => {
    // ASTM E29 rounding method examples (read in a secondary copy): 45.75 → 45.8, 45.45 → 45.4,
    // 45.45001 → 45.5, here as Rm = Fm / 100 mm² rounded to 0.1 MPa.
    const rm = (fm: string) => value(computeTensile({ s0Mm2: '100', maxForceN: fm }, { rounding: { strength: '0.1' } }).properties.tensileStrength);
    expect(rm('4575')).toBe('45.8');
    expect(rm('4545')).toBe('45.4');
    expect(rm('4545.001')).toBe('45.5');
  });

  it('takes a specification’s own rounding when given', () => {
    const results = computeTensile({ s0Mm2: '100', maxForceN: '45150' }, { rounding: { strength: '5' } });
    expect(value(results.properties.tensileStrength)).toBe('450');
    expect(results.rounding.strength).toBe('5');
  });
});

describe('analyseCurve on an elastic–linear-hardening curve', () => {
  // Worked by hand. Elastic line σ = 200 000·ε; plastic line σ = 250 + 2 000·(ε − 0.00125)
  // = 247.5 + 2 000·ε; offset line σ = 200 000·(ε − 0.002) = 200 000·ε − 400.
  // Offset meets plastic: 200 000·ε − 400 = 247.5 + 2 000·ε → 198 000·ε = 647.5
  // → ε = 0.003270202…, σ = 247.5 + 2 000 × 0.003270202… = 254.0404… MPa → Rp0.2 = 254 MPa.
  // Rm = 547.5 MPa, an exact half → 548 MPa (ASTM E29, even neighbour).
  // Window 10–40 % of 547.5 = 54.75 to 219 MPa: the elastic points at 55, 60, …, 215 MPa (33 points).
  const HAND_RP02 = 247.5 + 2000 * (647.5 / 198_000);

  it('reproduces the hand-worked offset yield, modulus and Rm', () => {
    expect(HAND_RP02).toBeCloseTo(254.0404, 4);
    const results = computeTensile(
      { s0Mm2: '100', record: { points: record(linearHardening()), extensometerGaugeLengthMm: '50' } },
      { material: 'steel' },
    );
    expect(results.errors).toEqual([]);
    expect(results.warnings).toEqual([]);
    // Both bracketing points lie on the plastic line, so interpolation is exact to float64 noise.
    expect(Math.abs(unrounded(results.properties.offsetYieldStrength) - HAND_RP02)).toBeLessThan(1e-6);
    expect(value(results.properties.offsetYieldStrength)).toBe('254');
    expect(value(results.properties.tensileStrength)).toBe('548');
    expect(value(results.properties.maxForce)).toBe('54750');
    expect(value(results.properties.modulus)).toBe('200.0');
    expect(results.properties.upperYieldStrength).toMatchObject({ status: 'not-determined', code: 'no-yield-drop' });
    expect(results.curve?.elastic.pointCount).toBe(33);
    expect(results.curve?.elastic.interceptMPa).toBeCloseTo(0, 6);
  });

  it('finds the same yield with slack at the start (the fitted intercept moves the offset line)', () => {
    // Shifting every strain by 0.0003 (a toe) moves the elastic line and the offset line together;
    // the stress where they meet the curve is unchanged.
    const shifted = record(linearHardening({ toe: 0.0003 }));
    const points = [{ forceN: 0, extensionMm: 0 }, { forceN: 100, extensionMm: 0.01 }, ...shifted.slice(1)];
    const results = computeTensile({ s0Mm2: '100', record: { points, extensometerGaugeLengthMm: '50' } });
    expect(Math.abs(unrounded(results.properties.offsetYieldStrength) - HAND_RP02)).toBeLessThan(1e-6);
    expect(results.curve?.elastic.interceptMPa).toBeCloseTo(-60, 6);
  });

  it('stays within 2 MPa of the hand value under ±1 MPa noise', () => {
    // Stated tolerance: ±1 MPa of noise moves the crossing by about as much, and the fitted slope
    // by a little; 2 MPa covers both.
    const results = computeTensile({ s0Mm2: '100', record: { points: record(linearHardening({ noise: 1 })), extensometerGaugeLengthMm: '50' } });
    expect(Math.abs(unrounded(results.properties.offsetYieldStrength) - HAND_RP02)).toBeLessThan(2);
    expect(results.properties.upperYieldStrength.status).toBe('not-determined');
  });

  it('takes the elastic window and offset from the options', () => {
    // With a 0.5 % offset: 200 000·ε − 1 000 = 247.5 + 2 000·ε → ε = 1 247.5 / 198 000,
    // σ = 247.5 + 2 000·ε = 260.1010… MPa.
    const points = record(linearHardening());
    const results = computeTensile(
      { s0Mm2: '100', record: { points, extensometerGaugeLengthMm: '50' } },
      { offsetStrain: 0.005, elasticWindow: { lower: 0.2, upper: 0.3 } },
    );
    expect(unrounded(results.properties.offsetYieldStrength)).toBeCloseTo(247.5 + 2000 * (1247.5 / 198_000), 6);
    expect(results.curve?.elastic.pointCount).toBe(11);
  });

  it('warns when the fitted modulus is far from the material’s', () => {
    // Typical moduli: steel about 200 GPa, aluminium about 70 GPa (handbook values, common
    // practice; from memory). A steel-like slope judged as aluminium is far off.
    expect(EXPECTED_MODULUS_MPA).toEqual({ steel: 200_000, aluminium: 70_000 });
    const points = record(linearHardening());
    const results = computeTensile({ s0Mm2: '100', record: { points, extensometerGaugeLengthMm: '50' } }, { material: 'aluminium' });
    expect(results.warnings.map((w) => w.code)).toEqual(['modulus-implausible']);
    expect(results.warnings[0]?.message).toMatch(/200 GPa .* typical 70 GPa for aluminium/);
    expect(results.properties.offsetYieldStrength.status).toBe('determined');
  });
});

describe('upper yield strength', () => {
  /**
   * A yield drop: elastic to 300 MPa, a fall to a 280 MPa plateau (strain 0.0016 to 0.015), then
   * hardening to 450 MPa at 0.15 and necking to 400 MPa. ReH = 300 MPa (the maximum before the
   * first fall, ISO 6892-1's definition as recalled). The 0.2 % offset line σ = 200 000·(ε − 0.002)
   * reaches 280 MPa at ε = 0.0034, on the plateau, so Rp0.2 = 280 MPa.
   */
  function yieldDrop(): { strain: number; stress: number }[] {
    const out: { strain: number; stress: number }[] = [];
    for (let k = 0; k <= 60; k++) out.push({ strain: k * 0.000025, stress: 200_000 * k * 0.000025 });
    out.push({ strain: 0.00155, stress: 290 }, { strain: 0.0016, stress: 280 });
    for (let k = 17; k <= 150; k++) out.push({ strain: k / 10_000, stress: 280 });
    for (let k = 151; k <= 1500; k++) out.push({ strain: k / 10_000, stress: 280 + (170 * (k - 150)) / 1350 });
    for (let k = 1; k <= 40; k++) out.push({ strain: 0.15 + k * 0.0005, stress: 450 - (50 * k) / 40 });
    return out;
  }

  it('reports ReH at the first maximum before the yield drop, and Rp0.2 on the plateau', () => {
    const results = computeTensile({ s0Mm2: '100', record: { points: record(yieldDrop()), extensometerGaugeLengthMm: '50' } });
    expect(results.errors).toEqual([]);
    expect(value(results.properties.upperYieldStrength)).toBe('300');
    expect(results.curve?.upperYield?.index).toBe(60);
    expect(unrounded(results.properties.offsetYieldStrength)).toBeCloseTo(280, 9);
    expect(value(results.properties.tensileStrength)).toBe('450');
  });

  it('reports ReH when the yield peak is the highest point of the test', () => {
    // Hardening after the drop that never climbs back over the peak: ReH = Rm.
    const curve = yieldDrop().map((p, i) => ({ strain: p.strain, stress: i > 60 ? Math.min(p.stress, 295) : p.stress }));
    const results = computeTensile({ s0Mm2: '100', record: { points: record(curve), extensometerGaugeLengthMm: '50' } });
    expect(value(results.properties.upperYieldStrength)).toBe('300');
    expect(value(results.properties.tensileStrength)).toBe('300');
  });

  it('does not take the fall after maximum force for a yield drop', () => {
    const results = computeTensile({ s0Mm2: '100', record: { points: record(linearHardening()), extensometerGaugeLengthMm: '50' } });
    expect(results.curve?.upperYield).toBeNull();
  });
});

describe('records and inputs that block results', () => {
  const points = record(linearHardening());

  it('blocks every stress result of a specimen that was never measured, but keeps Fm', () => {
    const results = computeTensile({ s0Mm2: null, record: { points, extensometerGaugeLengthMm: '50' }, originalGaugeLengthMm: '50', finalGaugeLengthMm: '61.25' });
    expect(codes(results)).toEqual(['not-measured']);
    expect(results.errors[0]?.message).toBe('The specimen has no measured cross-section S0; measure it before results can be computed.');
    for (const p of ['tensileStrength', 'offsetYieldStrength', 'upperYieldStrength', 'modulus', 'reductionOfArea'] as const) {
      expect(results.properties[p]).toMatchObject({ status: 'not-determined', code: 'not-measured' });
    }
    expect(value(results.properties.maxForce)).toBe('54750');
    expect(value(results.properties.elongation)).toBe('22.5');
    expect(results.curve).toBeNull();
  });

  it('blocks stress results for a zero or negative area', () => {
    for (const s0 of ['0', '-24.9', 'abc']) {
      const results = computeTensile({ s0Mm2: s0, maxForceN: '11250' });
      expect(codes(results)).toEqual(['bad-area']);
      expect(results.properties.tensileStrength).toMatchObject({ status: 'not-determined', code: 'bad-area' });
    }
    expect(() => tensileStrength('100', '0')).toThrow(RangeError);
    expect(() => reductionOfArea('-1', '1')).toThrow(RangeError);
    expect(() => elongationAfterFracture('0', '1')).toThrow(RangeError);
  });

  it('reports nothing from a record with no elastic part (too few points in the window)', () => {
    // Force jumps from nothing to past 40 % of its maximum: no point lies in the 10–40 % window.
    const jump: ForcePoint[] = [
      ...Array.from({ length: 10 }, (_, i) => ({ forceN: 0, extensionMm: i * 0.001 })),
      ...Array.from({ length: 20 }, (_, i) => ({ forceN: 30_000 + i * 1000, extensionMm: 0.02 + i * 0.1 })),
    ];
    const results = computeTensile({ s0Mm2: '100', record: { points: jump, extensometerGaugeLengthMm: '50' } });
    expect(codes(results)).toEqual(['no-elastic-part']);
    expect(results.errors[0]?.message).toMatch(/0 points lie between 10 % and 40 % of the maximum stress \(49 MPa to 196 MPa\)/);
    for (const p of ['maxForce', 'tensileStrength', 'offsetYieldStrength', 'upperYieldStrength', 'modulus'] as const) {
      expect(results.properties[p].status).toBe('not-determined');
    }
    expect(results.curve).toBeNull();
  });

  it('reports nothing from a record whose elastic slope is not positive', () => {
    const reversed = points.map((p) => ({ forceN: p.forceN, extensionMm: -p.extensionMm }));
    const results = computeTensile({ s0Mm2: '100', record: { points: reversed, extensometerGaugeLengthMm: '50' } });
    expect(codes(results)).toEqual(['no-elastic-part']);
    expect(results.errors[0]?.message).toMatch(/is not positive/);
  });

  it('keeps an entered Fm when the record cannot be trusted', () => {
    const reversed = points.map((p) => ({ forceN: p.forceN, extensionMm: -p.extensionMm }));
    const results = computeTensile({ s0Mm2: '100', maxForceN: '54750', record: { points: reversed, extensometerGaugeLengthMm: '50' } });
    expect(codes(results)).toEqual(['no-elastic-part']);
    expect(value(results.properties.tensileStrength)).toBe('548');
    expect(results.properties.offsetYieldStrength.status).toBe('not-determined');
  });

  it('warns when an entered Fm and the record’s peak disagree', () => {
    const results = computeTensile({ s0Mm2: '100', maxForceN: '56000', record: { points, extensometerGaugeLengthMm: '50' } });
    expect(results.warnings.map((w) => w.code)).toEqual(['max-force-mismatch']);
    expect(value(results.properties.tensileStrength)).toBe('560');
  });

  it('says why A and Z are missing or refused', () => {
    const missing = computeTensile({ s0Mm2: '100' });
    expect(missing.properties.elongation).toMatchObject({ code: 'no-gauge-lengths' });
    expect(missing.properties.reductionOfArea).toMatchObject({ code: 'no-final-area' });
    expect(missing.properties.offsetYieldStrength).toMatchObject({ code: 'no-record' });
    const wrong = computeTensile({ s0Mm2: '100', originalGaugeLengthMm: '50', finalGaugeLengthMm: '49', finalAreaMm2: '120' });
    expect(codes(wrong)).toEqual(['bad-final-length', 'bad-final-area']);
  });

  it('refuses a record with a bad extensometer gauge length or too few points', () => {
    expect(codes(computeTensile({ s0Mm2: '100', record: { points, extensometerGaugeLengthMm: '0' } }))).toEqual(['bad-gauge-length']);
    expect(codes(computeTensile({ s0Mm2: '100', record: { points: points.slice(0, 5), extensometerGaugeLengthMm: '50' } }))).toEqual(['too-few-points']);
    const outcome = analyseCurve(points, 100, 50, { elasticWindow: { lower: 0.5, upper: 0.2 } });
    expect(outcome.ok).toBe(false);
  });
});

describe('thinForDisplay', () => {
  it('keeps the first, the last and the maximum-force points', () => {
    const points = record(linearHardening({ noise: 0.5 }));
    const thin = thinForDisplay(points, 200);
    const fm = points.reduce((a, b) => (b.forceN > a.forceN ? b : a));
    expect(thin.length).toBeLessThanOrEqual(200);
    expect(thin).toContain(fm);
    expect(thin[0]).toBe(points[0]);
    expect(thin.at(-1)).toBe(points.at(-1));
    expect(Math.max(...thin.map((p) => p.forceN))).toBe(fm.forceN);
  });

  it('keeps a narrow peak and the indices the caller names', () => {
    const values = Array.from({ length: 10_000 }, (_, i) => Math.sin(i / 500));
    values[4321] = 5;
    values[777] = -5;
    const kept = thinIndices(values, 50, [1234]);
    expect(kept).toContain(4321);
    expect(kept).toContain(777);
    expect(kept).toContain(1234);
    expect(kept.length).toBeLessThanOrEqual(51);
    expect([...kept].sort((a, b) => a - b)).toEqual(kept);
  });

  it('returns short series whole and refuses a budget below 4', () => {
    expect(thinIndices([1, 2, 3], 10)).toEqual([0, 1, 2]);
    expect(() => thinIndices([1, 2, 3], 3)).toThrow(RangeError);
  });
});

describe('a 100,000-point record', () => {
  it('computes in well under a second', () => {
    // The synthetic curve resampled to 100,000 points, with noise.
    const base = linearHardening({ noise: 0.3 });
    const points: ForcePoint[] = [];
    for (let i = 0; i < 100_000; i++) {
      const p = base[Math.floor((i * base.length) / 100_000)];
      if (p) points.push({ forceN: p.stress * 100 + Math.sin(i) * 10, extensionMm: p.strain * 50 + i * 1e-9 });
    }
    const started = performance.now();
    const cpu = process.cpuUsage();
    const results = computeTensile({ s0Mm2: '100', record: { points, extensometerGaugeLengthMm: '50' }, originalGaugeLengthMm: '50', finalGaugeLengthMm: '61.25' }, { material: 'steel' });
    const thin = thinForDisplay(points, 2000, [results.curve?.maxForceIndex ?? 0]);
    const { user, system } = process.cpuUsage(cpu);
    const ms = performance.now() - started;
    // Wall time depends on what else the machine runs; CPU time is this process's own share.
    console.log(`computeTensile + thinForDisplay: 100,000 points in ${ms.toFixed(0)} ms wall, ${((user + system) / 1000).toFixed(0)} ms CPU`);
    expect(results.errors).toEqual([]);
    expect(Math.abs(unrounded(results.properties.offsetYieldStrength) - (247.5 + 2000 * (647.5 / 198_000)))).toBeLessThan(2);
    expect(thin.length).toBeLessThanOrEqual(2001);
  });
});

describe('stressStrain', () => {
  it('divides force by S0 and extension by Le', () => {
    const { stressMPa, strain } = stressStrain([{ forceN: 11250, extensionMm: 0.5 }], 25, 50);
    expect(stressMPa[0]).toBe(450);
    expect(strain[0]).toBe(0.01);
  });
});
