/**
 * Tensile results from a specimen's measured cross-section, its maximum force, its raw
 * force–extension record and its gauge lengths: tensile strength Rm, 0.2 % offset yield
 * strength Rp0.2, upper yield strength ReH where the curve shows a yield drop, the fitted
 * modulus as a plausibility check, elongation after fracture A and reduction of area Z.
 *
 * The curve is handled in float64 (a 100,000-point record must compute in well under a
 * second); every reported value is then taken as an exact decimal and rounded once, half to
 * even (ASTM E29), with decimal.js. Values that come straight from entered numbers (Rm from Fm
 * and S0, A, Z) are computed in decimals from the start.
 *
 * Nothing is reported from input that cannot be trusted: each result is either determined or
 * carries the reason it is not, and problems that block results are listed with the results they block.
 */
import type Decimal from 'decimal.js';
import { type DecimalInput, roundToIncrement, toDecimal } from '../decimal-rounding';
import type { ForcePoint } from './raw-record';

/**
 * Rounding increments ISO 6892-1 recommends when no product standard says otherwise: strength
 * to 1 MPa, the percentage elongation at yield Ae to 0.1 %, other elongations and the reduction
 * of area to 0.5 %. Recalled from ISO 6892-1, not read in it [memory], as CHECKS.md marks them.
 */
export const ISO_6892_1_ROUNDING = {
  strength: '1',
  yieldPointElongation: '0.1',
  elongation: '0.5',
  reductionOfArea: '0.5',
} as const;

/** Increments results are rounded to; a specification may set its own. */
export interface RoundingRules {
  /** MPa, for Rm, Rp0.2 and ReH. */
  readonly strength: string;
  /** Percentage points, for A. */
  readonly elongation: string;
  /** Percentage points, for Z. */
  readonly reductionOfArea: string;
}

/** Fm is shown to this increment, N (our choice; the stresses use the full value). */
export const MAX_FORCE_INCREMENT_N = '1';

/** The fitted modulus is shown in GPa to this increment; it is a plausibility check, not a reported result. */
export const MODULUS_INCREMENT_GPA = '0.1';

/** Material families with a typical Young's modulus for the plausibility check. */
export type MaterialFamily = 'steel' | 'aluminium';

/**
 * Typical Young's modulus by family, MPa. Handbook values (Callister, *Materials Science and
 * Engineering: An Introduction*, table of room-temperature elastic moduli: steel 207 GPa,
 * aluminium 69 GPa; from memory) rounded as is common practice to 200 and 70 GPa. Only a
 * yardstick for a warning: a tensile test's fitted slope is not a modulus measurement.
 */
export const EXPECTED_MODULUS_MPA: Readonly<Record<MaterialFamily, number>> = {
  steel: 200_000,
  aluminium: 70_000,
};

/** How the curve is analysed. Every field has a default. */
export interface CurveOptions {
  /** Stress window of the elastic fit, as fractions of the record's maximum stress; 0.1 to 0.4 by default. */
  readonly elasticWindow?: { readonly lower: number; readonly upper: number };
  /** Fewest points the elastic fit may use; 5 by default. */
  readonly minElasticPoints?: number;
  /** Plastic strain of the offset line; 0.002 (0.2 %) by default. */
  readonly offsetStrain?: number;
  /**
   * How far (fraction of the peak stress) the curve must fall after a local maximum, and then rise
   * again, for the maximum to count as an upper yield strength; 0.01 by default. ISO 6892-1 takes ReH
   * at the first decrease in force; a threshold keeps signal noise from counting as one (our choice).
   */
  readonly yieldDropThreshold?: number;
  /** The material family whose typical modulus the fitted one is compared with. */
  readonly material?: MaterialFamily;
  /** A typical modulus of the lab's own, MPa; wins over `material`. */
  readonly expectedModulusMPa?: number;
  /** Relative difference from the typical modulus that draws a warning; 0.2 by default. */
  readonly modulusTolerance?: number;
}

/** Options of {@link computeTensile}. */
export interface TensileOptions extends CurveOptions {
  /** Rounding increments; {@link ISO_6892_1_ROUNDING} by default. */
  readonly rounding?: Partial<RoundingRules>;
  /** Relative difference between an entered Fm and the record's peak that draws a warning; 0.01 by default. */
  readonly maxForceTolerance?: number;
}

/** What a specimen's results are computed from. Missing values are null or left out. */
export interface TensileInput {
  /** Original cross-section S0, mm² (from the measurement). Missing when the specimen was never measured. */
  readonly s0Mm2?: DecimalInput | null;
  /** The raw record and its extensometer gauge length Le, mm. */
  readonly record?: { readonly points: readonly ForcePoint[]; readonly extensometerGaugeLengthMm: DecimalInput } | null;
  /** Maximum force Fm as entered or posted by the instrument, N. Without it, Fm is the record's peak. */
  readonly maxForceN?: DecimalInput | null;
  /** Original gauge length L0, mm. */
  readonly originalGaugeLengthMm?: DecimalInput | null;
  /** Final gauge length after fracture Lu, mm. */
  readonly finalGaugeLengthMm?: DecimalInput | null;
  /** Smallest cross-section after fracture Su, mm². */
  readonly finalAreaMm2?: DecimalInput | null;
}

/** The results computed, keyed by property. */
export const TENSILE_PROPERTIES = [
  'maxForce',
  'tensileStrength',
  'offsetYieldStrength',
  'upperYieldStrength',
  'modulus',
  'elongation',
  'reductionOfArea',
] as const;

/** One of the results. */
export type TensileProperty = (typeof TENSILE_PROPERTIES)[number];

/** The symbol each result is printed with (ISO 6892-1 symbols). */
export const PROPERTY_SYMBOL: Readonly<Record<TensileProperty, string>> = {
  maxForce: 'Fm',
  tensileStrength: 'Rm',
  offsetYieldStrength: 'Rp0.2',
  upperYieldStrength: 'ReH',
  modulus: 'E',
  elongation: 'A',
  reductionOfArea: 'Z',
};

/** Why something could not be computed, or what looks wrong. */
export type TensileProblemCode =
  | 'not-measured'
  | 'bad-area'
  | 'bad-gauge-length'
  | 'bad-option'
  | 'no-record'
  | 'no-max-force'
  | 'bad-max-force'
  | 'too-few-points'
  | 'no-elastic-part'
  | 'offset-not-reached'
  | 'no-yield-drop'
  | 'no-gauge-lengths'
  | 'bad-final-length'
  | 'no-final-area'
  | 'bad-final-area'
  | 'modulus-implausible'
  | 'max-force-mismatch';

/** A problem with a specimen's input, and which results it blocks (none for a warning). */
export interface TensileProblem {
  readonly code: TensileProblemCode;
  readonly message: string;
  readonly blocks: readonly TensileProperty[];
}

/** A result that was determined, rounded once, with its full value kept. */
export interface DeterminedResult {
  readonly status: 'determined';
  /** Rounded for the report, as a decimal string. */
  readonly value: string;
  /** The full value before rounding, as a decimal string. */
  readonly unrounded: string;
  readonly unit: 'N' | 'MPa' | 'GPa' | '%';
  /** The rounding increment used. */
  readonly increment: string;
  /** Where the value came from, in a few words for the record. */
  readonly basis: string;
}

/** A result that could not be determined, and why. */
export interface UndeterminedResult {
  readonly status: 'not-determined';
  readonly code: TensileProblemCode;
  readonly reason: string;
}

/** Either. */
export type PropertyResult = DeterminedResult | UndeterminedResult;

/** The fitted elastic line σ = slope·ε + intercept and where it was fitted. */
export interface ElasticFit {
  /** MPa per unit strain (the fitted modulus). */
  readonly slopeMPa: number;
  /** MPa; non-zero when the record starts with slack or a preload. */
  readonly interceptMPa: number;
  readonly firstIndex: number;
  readonly lastIndex: number;
  readonly pointCount: number;
  readonly fromStressMPa: number;
  readonly toStressMPa: number;
  /** Coefficient of determination of the fit. */
  readonly rSquared: number;
}

/** What the chart needs: stress and strain per point, the fitted and offset lines, and the marked points. */
export interface CurveAnalysis {
  readonly stressMPa: Float64Array;
  readonly strain: Float64Array;
  readonly maxForceIndex: number;
  readonly maxForceN: number;
  readonly elastic: ElasticFit;
  /** The offset line is σ = slope·(ε − offsetStrain) + intercept. */
  readonly offsetStrain: number;
  /** Where the offset line meets the curve, interpolated between points `afterIndex` and `afterIndex + 1`. */
  readonly offsetYield: { readonly strain: number; readonly stressMPa: number; readonly afterIndex: number } | null;
  /** The upper yield point, where the curve shows a yield drop. */
  readonly upperYield: { readonly index: number; readonly stressMPa: number } | null;
}

/** Everything computed for one specimen. */
export interface TensileResults {
  readonly properties: Readonly<Record<TensileProperty, PropertyResult>>;
  /** Problems that block one or more results. */
  readonly errors: readonly TensileProblem[];
  /** Things worth a look that block nothing. */
  readonly warnings: readonly TensileProblem[];
  /** The analysed curve, when the record could be trusted. */
  readonly curve: CurveAnalysis | null;
  /** L0 in mm as given, for judging elongation limits that name a gauge length. */
  readonly originalGaugeLengthMm: string | null;
  /** The rounding increments used. */
  readonly rounding: RoundingRules;
}

/**
 * Tensile strength Rm = Fm / S0, exactly.
 *
 * @param maxForceN - Fm in N.
 * @param s0Mm2 - S0 in mm².
 * @returns Rm in MPa (N/mm²), unrounded.
 * @throws RangeError when S0 is not positive.
 */
export function tensileStrength(maxForceN: DecimalInput, s0Mm2: DecimalInput): Decimal {
  const s0 = toDecimal(s0Mm2);
  if (s0.lte(0)) throw new RangeError('the cross-section area must be greater than zero');
  return toDecimal(maxForceN).div(s0);
}

/**
 * Percentage elongation after fracture A = (Lu − L0) / L0 × 100, exactly.
 *
 * @param originalGaugeLengthMm - L0, mm.
 * @param finalGaugeLengthMm - Lu, mm.
 * @returns A in %, unrounded (negative when Lu < L0; the caller decides what that means).
 * @throws RangeError when L0 is not positive.
 */
export function elongationAfterFracture(originalGaugeLengthMm: DecimalInput, finalGaugeLengthMm: DecimalInput): Decimal {
  const l0 = toDecimal(originalGaugeLengthMm);
  if (l0.lte(0)) throw new RangeError('the original gauge length must be greater than zero');
  return toDecimal(finalGaugeLengthMm).minus(l0).div(l0).mul(100);
}

/**
 * Percentage reduction of area Z = (S0 − Su) / S0 × 100, exactly.
 *
 * @param s0Mm2 - Original cross-section S0, mm².
 * @param suMm2 - Smallest cross-section after fracture Su, mm².
 * @returns Z in %, unrounded.
 * @throws RangeError when S0 is not positive.
 */
export function reductionOfArea(s0Mm2: DecimalInput, suMm2: DecimalInput): Decimal {
  const s0 = toDecimal(s0Mm2);
  if (s0.lte(0)) throw new RangeError('the original cross-section area must be greater than zero');
  return s0.minus(toDecimal(suMm2)).div(s0).mul(100);
}

/**
 * Engineering stress σ = F / S0 (MPa) and strain ε = ΔL / Le for every point of a record.
 *
 * @param points - The record in N and mm.
 * @param s0Mm2 - S0, mm² (positive).
 * @param extensometerGaugeLengthMm - Le, mm (positive).
 */
export function stressStrain(
  points: readonly ForcePoint[],
  s0Mm2: number,
  extensometerGaugeLengthMm: number,
): { stressMPa: Float64Array; strain: Float64Array } {
  const stressMPa = new Float64Array(points.length);
  const strain = new Float64Array(points.length);
  for (let i = 0; i < points.length; i++) {
    const p = points[i];
    if (p === undefined) continue;
    stressMPa[i] = p.forceN / s0Mm2;
    strain[i] = p.extensionMm / extensometerGaugeLengthMm;
  }
  return { stressMPa, strain };
}

const RECORD_RESULTS: readonly TensileProperty[] = ['offsetYieldStrength', 'upperYieldStrength', 'modulus'];

/** Fewest points a record may have for the curve to be analysed. */
export const MIN_CURVE_POINTS = 10;

function fail(code: TensileProblemCode, message: string, blocks: readonly TensileProperty[]): TensileProblem {
  return { code, message, blocks };
}

function percent(fraction: number): string {
  return `${toDecimal(fraction).mul(100).toString()} %`;
}

function mpa(value: number): string {
  return `${Math.round(value)} MPa`;
}

/**
 * Analyses a record's curve: the maximum force, the elastic slope fitted by least squares over
 * a stress window, the 0.2 % offset yield point and the upper yield point where there is a yield drop.
 *
 * @param points - The record in N and mm.
 * @param s0Mm2 - S0, mm².
 * @param extensometerGaugeLengthMm - Le, mm.
 * @param options - Window, offset, yield-drop threshold.
 * @returns The analysis; or the problems that make the record untrustworthy (too few points, no
 *   positive force, no elastic part: too few points in the window or a slope that is not positive).
 */
export function analyseCurve(
  points: readonly ForcePoint[],
  s0Mm2: number,
  extensometerGaugeLengthMm: number,
  options: CurveOptions = {},
): { ok: true; analysis: CurveAnalysis } | { ok: false; problems: TensileProblem[] } {
  const lower = options.elasticWindow?.lower ?? 0.1;
  const upper = options.elasticWindow?.upper ?? 0.4;
  const minPoints = options.minElasticPoints ?? 5;
  const offsetStrain = options.offsetStrain ?? 0.002;
  const dropThreshold = options.yieldDropThreshold ?? 0.01;
  const blocked = ['maxForce', 'tensileStrength', ...RECORD_RESULTS] as const;
  if (!(lower >= 0 && upper > lower && upper <= 1) || !(minPoints >= 2) || !(offsetStrain > 0) || !(dropThreshold > 0 && dropThreshold < 1)) {
    return {
      ok: false,
      problems: [fail('bad-option', 'The curve options are out of range: the window needs 0 ≤ lower < upper ≤ 1, and the offset and threshold must be positive.', blocked)],
    };
  }
  if (!(s0Mm2 > 0) || !(extensometerGaugeLengthMm > 0)) {
    return { ok: false, problems: [fail('bad-option', 'Stress and strain need a positive area and gauge length.', blocked)] };
  }
  if (points.length < MIN_CURVE_POINTS) {
    return {
      ok: false,
      problems: [fail('too-few-points', `The record has ${points.length} points; at least ${MIN_CURVE_POINTS} are needed.`, blocked)],
    };
  }
  const { stressMPa, strain } = stressStrain(points, s0Mm2, extensometerGaugeLengthMm);
  const n = stressMPa.length;
  let fmIndex = 0;
  for (let i = 1; i < n; i++) if ((stressMPa[i] ?? 0) > (stressMPa[fmIndex] ?? 0)) fmIndex = i;
  const peak = stressMPa[fmIndex] ?? 0;
  if (!(peak > 0)) {
    return { ok: false, problems: [fail('no-max-force', 'The record never shows a positive force; check the force column and its sign.', blocked)] };
  }

  // The window runs over the first loading only: up to the first point above the upper bound, so
  // that neither the plastic part nor the fall after maximum force enters the fit.
  const from = lower * peak;
  const to = upper * peak;
  let first = -1;
  let last = -1;
  let count = 0;
  let sx = 0;
  let sy = 0;
  for (let i = 0; i <= fmIndex; i++) {
    const s = stressMPa[i] ?? 0;
    if (s > to) break;
    if (s >= from) {
      if (first < 0) first = i;
      last = i;
      count++;
      sx += strain[i] ?? 0;
      sy += s;
    }
  }
  const windowWords = `between ${percent(lower)} and ${percent(upper)} of the maximum stress (${mpa(from)} to ${mpa(to)})`;
  if (count < minPoints) {
    return {
      ok: false,
      problems: [
        fail(
          'no-elastic-part',
          `The record has no usable elastic part: ${count} point${count === 1 ? '' : 's'} lie ${windowWords} on first loading, and at least ${minPoints} are needed to fit the elastic slope.`,
          RECORD_RESULTS.concat(['maxForce', 'tensileStrength']),
        ),
      ],
    };
  }
  const mx = sx / count;
  const my = sy / count;
  let sxx = 0;
  let sxy = 0;
  let syy = 0;
  for (let i = first; i <= last; i++) {
    const s = stressMPa[i] ?? 0;
    if (s < from || s > to) continue;
    const dx = (strain[i] ?? 0) - mx;
    const dy = s - my;
    sxx += dx * dx;
    sxy += dx * dy;
    syy += dy * dy;
  }
  const slope = sxx > 0 ? sxy / sxx : Number.NaN;
  if (!(slope > 0) || !Number.isFinite(slope)) {
    return {
      ok: false,
      problems: [
        fail(
          'no-elastic-part',
          `The record has no usable elastic part: the slope fitted to the ${count} points ${windowWords} is not positive. Check the extension column and its sign.`,
          RECORD_RESULTS.concat(['maxForce', 'tensileStrength']),
        ),
      ],
    };
  }
  const intercept = my - slope * mx;
  const elastic: ElasticFit = {
    slopeMPa: slope,
    interceptMPa: intercept,
    firstIndex: first,
    lastIndex: last,
    pointCount: count,
    fromStressMPa: from,
    toStressMPa: to,
    rSquared: syy > 0 ? (sxy * sxy) / (sxx * syy) : 1,
  };

  // Offset line: σ = slope·(ε − offset) + intercept. g > 0 while the curve lies above it.
  const g = (i: number) => (stressMPa[i] ?? 0) - (slope * ((strain[i] ?? 0) - offsetStrain) + intercept);
  let offsetYield: CurveAnalysis['offsetYield'] = null;
  for (let i = first + 1; i <= fmIndex; i++) {
    const gi = g(i);
    if (gi > 0) continue;
    const gPrev = g(i - 1);
    const t = gPrev > 0 ? gPrev / (gPrev - gi) : 0;
    const s0 = stressMPa[i - 1] ?? 0;
    const e0 = strain[i - 1] ?? 0;
    offsetYield = {
      stressMPa: s0 + t * ((stressMPa[i] ?? 0) - s0),
      strain: e0 + t * ((strain[i] ?? 0) - e0),
      afterIndex: i - 1,
    };
    break;
  }

  const upperYield = findUpperYield(stressMPa, first, from, dropThreshold);
  return {
    ok: true,
    analysis: {
      stressMPa,
      strain,
      maxForceIndex: fmIndex,
      maxForceN: points[fmIndex]?.forceN ?? 0,
      elastic,
      offsetStrain,
      offsetYield,
      upperYield,
    },
  };
}

/**
 * The first local maximum after which the curve falls by more than the threshold and then rises
 * again by as much (hardening after the yield drop), or null. A fall that never recovers is the
 * necking before fracture, not a yield drop.
 */
function findUpperYield(stress: Float64Array, start: number, minStress: number, threshold: number): CurveAnalysis['upperYield'] {
  const n = stress.length;
  let peak = start;
  let i = start + 1;
  for (; i < n; i++) {
    const s = stress[i] ?? 0;
    const p = stress[peak] ?? 0;
    if (s > p) peak = i;
    else if (s < p * (1 - threshold) && p >= minStress) break;
  }
  if (i >= n) return null;
  const peakStress = stress[peak] ?? 0;
  const rise = threshold * peakStress;
  let low = stress[i] ?? 0;
  for (let j = i + 1; j < n; j++) {
    const s = stress[j] ?? 0;
    if (s < low) low = s;
    else if (s >= low + rise) return { index: peak, stressMPa: peakStress };
  }
  return null;
}

function determined(value: Decimal, unit: DeterminedResult['unit'], increment: string, basis: string): DeterminedResult {
  return { status: 'determined', value: roundToIncrement(value, increment), unrounded: value.toString(), unit, increment, basis };
}

function undetermined(code: TensileProblemCode, reason: string): UndeterminedResult {
  return { status: 'not-determined', code, reason };
}

function readPositive(value: DecimalInput | null | undefined): { kind: 'missing' } | { kind: 'bad' } | { kind: 'ok'; value: Decimal } {
  if (value === null || value === undefined || (typeof value === 'string' && value.trim() === '')) return { kind: 'missing' };
  try {
    const d = toDecimal(value);
    return d.gt(0) ? { kind: 'ok', value: d } : { kind: 'bad' };
  } catch {
    return { kind: 'bad' };
  }
}

/**
 * Computes every tensile result a specimen's input allows, rounded as ISO 6892-1 recommends
 * unless `options.rounding` says otherwise, with the reason for each result that cannot be given.
 *
 * @param input - S0, the record with Le, Fm, L0, Lu, Su (each may be missing).
 * @param options - Curve analysis, rounding, tolerances for warnings.
 * @returns Results per property, blocking problems, warnings, the curve for the chart, L0 and the rounding used.
 */
export function computeTensile(input: TensileInput, options: TensileOptions = {}): TensileResults {
  const rounding: RoundingRules = { ...ISO_6892_1_ROUNDING, ...options.rounding };
  const errors: TensileProblem[] = [];
  const warnings: TensileProblem[] = [];
  const results: Partial<Record<TensileProperty, PropertyResult>> = {};
  const block = (problem: TensileProblem) => {
    errors.push(problem);
    for (const p of problem.blocks) {
      results[p] ??= undetermined(problem.code, problem.message);
    }
  };

  const stressResults: TensileProperty[] = ['tensileStrength', 'offsetYieldStrength', 'upperYieldStrength', 'modulus', 'reductionOfArea'];
  const s0 = readPositive(input.s0Mm2);
  if (s0.kind === 'missing') {
    block(fail('not-measured', 'The specimen has no measured cross-section S0; measure it before results can be computed.', stressResults));
  } else if (s0.kind === 'bad') {
    block(fail('bad-area', `The cross-section S0 must be a number greater than zero, not ${String(input.s0Mm2)}.`, stressResults));
  }

  const enteredFm = readPositive(input.maxForceN);
  if (enteredFm.kind === 'bad') {
    block(fail('bad-max-force', `The maximum force Fm must be a number greater than zero, not ${String(input.maxForceN)}.`, ['maxForce', 'tensileStrength']));
  }

  let curve: CurveAnalysis | null = null;
  let recordPeakN: number | null = null;
  const record = input.record ?? null;
  if (record === null) {
    for (const p of RECORD_RESULTS) results[p] ??= undetermined('no-record', 'No force–extension record was given.');
  } else {
    const le = readPositive(record.extensometerGaugeLengthMm);
    if (le.kind !== 'ok') {
      block(fail('bad-gauge-length', 'The extensometer gauge length Le must be a number greater than zero.', [...RECORD_RESULTS, 'maxForce', 'tensileStrength']));
    } else {
      // Without S0 the record is still checked (its shape does not depend on the scale of stress)
      // so that its peak force can be reported; its stresses are not.
      const outcome = analyseCurve(record.points, s0.kind === 'ok' ? s0.value.toNumber() : 1, le.value.toNumber(), options);
      if (outcome.ok) {
        if (s0.kind === 'ok') curve = outcome.analysis;
        recordPeakN = outcome.analysis.maxForceN;
      }
      // A record that cannot be trusted reports nothing, but an Fm entered apart from it still stands.
      else for (const p of outcome.problems) block(enteredFm.kind === 'ok' ? { ...p, blocks: p.blocks.filter((b) => b !== 'maxForce' && b !== 'tensileStrength') } : p);
    }
  }

  // Fm and Rm.
  let fm: { value: Decimal; basis: string } | null = null;
  if (enteredFm.kind === 'ok') {
    fm = { value: enteredFm.value, basis: 'entered' };
    if (recordPeakN !== null) {
      const peak = toDecimal(recordPeakN);
      const tolerance = options.maxForceTolerance ?? 0.01;
      if (peak.minus(enteredFm.value).abs().gt(enteredFm.value.mul(tolerance))) {
        warnings.push(
          fail(
            'max-force-mismatch',
            `The entered maximum force ${enteredFm.value.toString()} N and the record's peak ${peak.toSignificantDigits(8).toString()} N differ by more than ${percent(tolerance)}; the entered value is used.`,
            [],
          ),
        );
      }
    }
  } else if (recordPeakN !== null) {
    fm = { value: toDecimal(recordPeakN), basis: 'peak of the record' };
  }
  if (fm !== null) {
    results.maxForce ??= determined(fm.value, 'N', MAX_FORCE_INCREMENT_N, fm.basis);
    if (s0.kind === 'ok') {
      results.tensileStrength ??= determined(tensileStrength(fm.value, s0.value), 'MPa', rounding.strength, `Fm ${fm.basis} / S0`);
    }
  } else {
    const reason = 'No maximum force was entered and there is no record to take it from.';
    results.maxForce ??= undetermined('no-max-force', reason);
    results.tensileStrength ??= undetermined('no-max-force', reason);
  }

  // Results of the curve.
  if (curve !== null) {
    const { offsetYield, upperYield, elastic } = curve;
    results.offsetYieldStrength ??=
      offsetYield === null
        ? undetermined('offset-not-reached', `The curve does not reach the ${percent(curve.offsetStrain)} offset line before maximum force.`)
        : determined(toDecimal(offsetYield.stressMPa), 'MPa', rounding.strength, `offset ${percent(curve.offsetStrain)}, elastic slope fitted over ${elastic.pointCount} points`);
    results.upperYieldStrength ??=
      upperYield === null
        ? undetermined('no-yield-drop', 'The curve shows no yield drop, so there is no upper yield strength.')
        : determined(toDecimal(upperYield.stressMPa), 'MPa', rounding.strength, 'first maximum before the yield drop');
    results.modulus ??= determined(toDecimal(elastic.slopeMPa).div(1000), 'GPa', MODULUS_INCREMENT_GPA, 'slope of the elastic fit (plausibility only)');
    const expected = options.expectedModulusMPa ?? (options.material === undefined ? undefined : EXPECTED_MODULUS_MPA[options.material]);
    const tolerance = options.modulusTolerance ?? 0.2;
    if (expected !== undefined && Math.abs(elastic.slopeMPa - expected) > tolerance * expected) {
      warnings.push(
        fail(
          'modulus-implausible',
          `The fitted modulus ${(elastic.slopeMPa / 1000).toFixed(0)} GPa is more than ${percent(tolerance)} away from the typical ${(expected / 1000).toFixed(0)} GPa${options.material === undefined ? '' : ` for ${options.material}`}: check the extensometer gauge length, the extension unit and whether the extension is the extensometer's or the crosshead's.`,
          [],
        ),
      );
    }
  }

  // A from L0 and Lu.
  const l0 = readPositive(input.originalGaugeLengthMm);
  const lu = readPositive(input.finalGaugeLengthMm);
  if (l0.kind === 'missing' || lu.kind === 'missing') {
    results.elongation ??= undetermined('no-gauge-lengths', 'Both the original gauge length L0 and the final gauge length Lu are needed for A.');
  } else if (l0.kind === 'bad' || lu.kind === 'bad') {
    block(fail('bad-final-length', 'The gauge lengths L0 and Lu must be numbers greater than zero.', ['elongation']));
  } else if (lu.value.lt(l0.value)) {
    block(fail('bad-final-length', `The final gauge length Lu ${lu.value.toString()} mm is shorter than L0 ${l0.value.toString()} mm; check both.`, ['elongation']));
  } else {
    results.elongation ??= determined(elongationAfterFracture(l0.value, lu.value), '%', rounding.elongation, `(Lu − L0)/L0 with L0 ${l0.value.toString()} mm`);
  }

  // Z from S0 and Su.
  const su = readPositive(input.finalAreaMm2);
  if (su.kind === 'missing') {
    results.reductionOfArea ??= undetermined('no-final-area', 'The final cross-section Su was not entered.');
  } else if (su.kind === 'bad') {
    block(fail('bad-final-area', 'The final cross-section Su must be a number greater than zero.', ['reductionOfArea']));
  } else if (s0.kind === 'ok' && su.value.gt(s0.value)) {
    block(fail('bad-final-area', `The final cross-section Su ${su.value.toString()} mm² is larger than S0 ${s0.value.toString()} mm²; check both.`, ['reductionOfArea']));
  } else if (s0.kind === 'ok') {
    results.reductionOfArea ??= determined(reductionOfArea(s0.value, su.value), '%', rounding.reductionOfArea, '(S0 − Su)/S0');
  }

  const properties = Object.fromEntries(
    TENSILE_PROPERTIES.map((p) => [p, results[p] ?? undetermined('no-max-force', 'Not computed.')]),
  ) as Record<TensileProperty, PropertyResult>;
  return {
    properties,
    errors,
    warnings,
    curve,
    originalGaugeLengthMm: l0.kind === 'ok' ? l0.value.toString() : null,
    rounding,
  };
}

/**
 * Indices of a long series to draw, keeping its extremes: the first and last points, the
 * overall maximum, and the minimum and maximum of each of ⌊(maxPoints − 2)/2⌋ equal buckets
 * (so every local peak wider than a bucket survives), plus any indices the caller must keep.
 *
 * @param values - The series to thin (e.g. force or stress per point).
 * @param maxPoints - The most points wanted, 4 or more (kept indices come on top).
 * @param keep - Indices that must survive, e.g. the upper yield point or the offset crossing.
 * @returns Sorted, distinct indices.
 * @throws RangeError when maxPoints is below 4.
 */
export function thinIndices(values: ArrayLike<number>, maxPoints: number, keep: readonly number[] = []): number[] {
  if (!Number.isInteger(maxPoints) || maxPoints < 4) throw new RangeError(`maxPoints must be a whole number of at least 4, got ${maxPoints}`);
  const n = values.length;
  const kept = keep.filter((k) => Number.isInteger(k) && k >= 0 && k < n);
  if (n <= maxPoints) return Array.from({ length: n }, (_, i) => i);
  const chosen = new Set<number>([0, n - 1, ...kept]);
  let top = 0;
  for (let i = 1; i < n; i++) if ((values[i] ?? 0) > (values[top] ?? 0)) top = i;
  chosen.add(top);
  const buckets = Math.floor((maxPoints - 2) / 2);
  const interior = n - 2;
  for (let b = 0; b < buckets; b++) {
    const start = 1 + Math.floor((b * interior) / buckets);
    const end = 1 + Math.floor(((b + 1) * interior) / buckets);
    if (end <= start) continue;
    let lo = start;
    let hi = start;
    for (let i = start + 1; i < end; i++) {
      const v = values[i] ?? 0;
      if (v < (values[lo] ?? 0)) lo = i;
      if (v > (values[hi] ?? 0)) hi = i;
    }
    chosen.add(lo);
    chosen.add(hi);
  }
  return [...chosen].sort((a, b) => a - b);
}

/**
 * Thins a record for drawing without moving its extremes: see {@link thinIndices}; thinned by force.
 *
 * @param points - The record.
 * @param maxPoints - The most points wanted, 4 or more.
 * @param keepIndices - Indices that must survive.
 * @returns The kept points, in their original order.
 */
export function thinForDisplay<T extends { readonly forceN: number }>(points: readonly T[], maxPoints: number, keepIndices: readonly number[] = []): T[] {
  const forces = new Float64Array(points.length);
  for (let i = 0; i < points.length; i++) forces[i] = points[i]?.forceN ?? 0;
  return thinIndices(forces, maxPoints, keepIndices).flatMap((i) => {
    const p = points[i];
    return p === undefined ? [] : [p];
  });
}
