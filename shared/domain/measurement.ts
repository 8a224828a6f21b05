/**
 * Cross-section measurement: the area S0 from repeated readings under an explicit
 * area policy, tolerance checks against a geometry, stress from force, and the
 * proportional gauge length. Readings arrive as decimal strings ("12.52") and all
 * arithmetic is exact decimal arithmetic (decimal.js); results are decimal strings.
 *
 * Why a policy: measuring width and thickness three times and keeping the minimum of
 * each is common practice in labs, but standards differ (some use the least of the
 * measured section areas, others an average of the sections), so the lab chooses and
 * the record says which was used.
 */
import { z } from 'zod';
import type Decimal from 'decimal.js';
import { type DecimalInput, HalfmarkDecimal, roundHalfEven, toDecimal } from './decimal-rounding';
import type { SpecimenGeometry } from './specimen-geometries';

/**
 * How the cross-section area is taken from repeated readings.
 * - 'min-dimensions': minimum width × minimum thickness (round: the minimum diameter). Common practice; the default.
 * - 'least-section': the least of the section areas w_i·t_i measured at the same place (round: same as min-dimensions).
 * - 'mean-section': the mean of the section areas.
 */
export type AreaPolicy = 'min-dimensions' | 'least-section' | 'mean-section';

/** Every area policy; the first is the default. */
export const AREA_POLICIES = ['min-dimensions', 'least-section', 'mean-section'] as const satisfies readonly AreaPolicy[];

/** Decimal places of a cross-section area in mm². */
export const AREA_DECIMALS = 4;

/** Readings of a flat specimen, mm: width_i and thickness_i taken at the same place. */
export interface FlatReadings {
  readonly shape: 'flat';
  readonly width: readonly string[];
  readonly thickness: readonly string[];
}

/** Readings of a round specimen, mm. */
export interface RoundReadings {
  readonly shape: 'round';
  readonly diameter: readonly string[];
}

/** Readings of either shape. */
export type Readings = FlatReadings | RoundReadings;

/** A cross-section area with what it was made from. */
export interface CrossSection {
  readonly shape: 'flat' | 'round';
  readonly policy: AreaPolicy;
  /** S0 in mm², rounded half to even to {@link AREA_DECIMALS} places. */
  readonly area: string;
  /** S0 in mm² before rounding (60 significant digits where it does not terminate). */
  readonly areaUnrounded: string;
  /** Each measured section's own area, mm², rounded like `area`, in reading order. */
  readonly sections: readonly string[];
  /** A sentence saying how the area was obtained, for the record. */
  readonly basis: string;
}

const PI = HalfmarkDecimal.acos(-1);

function positiveReadings(values: readonly string[], name: string): Decimal[] {
  if (values.length === 0) {
    throw new RangeError(`at least one ${name} reading is needed`);
  }
  return values.map((v, i) => {
    const problem = readingProblem(v);
    if (problem) throw new RangeError(`${name} reading ${i + 1}: ${problem}`);
    return toDecimal(v);
  });
}

function minOf(values: readonly Decimal[]): Decimal {
  return HalfmarkDecimal.min(...values);
}

function meanOf(values: readonly Decimal[]): Decimal {
  return HalfmarkDecimal.sum(...values).div(values.length);
}

function circleArea(d: Decimal): Decimal {
  return PI.mul(d.pow(2)).div(4);
}

function result(
  shape: 'flat' | 'round',
  policy: AreaPolicy,
  area: Decimal,
  sections: readonly Decimal[],
  basis: string,
): CrossSection {
  return {
    shape,
    policy,
    area: roundHalfEven(area, AREA_DECIMALS),
    areaUnrounded: area.toString(),
    sections: sections.map((s) => roundHalfEven(s, AREA_DECIMALS)),
    basis,
  };
}

/**
 * Computes the cross-section area S0 from repeated readings under an explicit policy.
 * Flat: S0 = w·t; round: S0 = π·d²/4.
 *
 * @param readings - Flat (width and thickness, same count, paired by index) or round (diameter) readings in mm.
 * @param policy - How to combine the readings; 'min-dimensions' by default.
 * @returns The area (mm², 4 places), its unrounded value, each section's area and a basis sentence.
 * @throws RangeError when a reading is not a positive decimal or flat reading counts differ.
 */
export function crossSectionArea(readings: Readings, policy: AreaPolicy = 'min-dimensions'): CrossSection {
  if (readings.shape === 'round') {
    const d = positiveReadings(readings.diameter, 'diameter');
    const sections = d.map(circleArea);
    if (policy === 'mean-section') {
      return result('round', policy, meanOf(sections), sections, `mean of ${d.length} section areas π·d²/4`);
    }
    const dMin = minOf(d);
    // The smallest diameter gives the smallest circle, so both minimum policies agree for rounds.
    return result('round', policy, circleArea(dMin), sections, `π·d²/4 with the minimum diameter ${dMin.toString()} mm`);
  }

  const w = positiveReadings(readings.width, 'width');
  const t = positiveReadings(readings.thickness, 'thickness');
  if (w.length !== t.length) {
    throw new RangeError(`width and thickness need the same number of readings (${w.length} and ${t.length})`);
  }
  const sections = w.map((wi, i) => wi.mul(t[i] ?? 0));
  switch (policy) {
    case 'min-dimensions': {
      const wMin = minOf(w);
      const tMin = minOf(t);
      return result(
        'flat',
        policy,
        wMin.mul(tMin),
        sections,
        `minimum width ${wMin.toString()} mm × minimum thickness ${tMin.toString()} mm`,
      );
    }
    case 'least-section': {
      const least = minOf(sections);
      const i = sections.findIndex((s) => s.eq(least));
      return result(
        'flat',
        policy,
        least,
        sections,
        `least section area, at reading ${i + 1}: ${w[i]?.toString()} mm × ${t[i]?.toString()} mm`,
      );
    }
    case 'mean-section':
      return result('flat', policy, meanOf(sections), sections, `mean of ${sections.length} section areas w·t`);
  }
}

/**
 * Engineering stress from a force and an area: MPa = N / mm².
 *
 * @param forceN - Force in N.
 * @param areaMm2 - Area in mm²; pass the recorded (rounded) area so anyone can repeat the arithmetic.
 * @param decimals - Decimal places of the result, 2 by default (report rounding is a separate step).
 * @returns The stress in MPa as a decimal string, rounded half to even.
 * @throws RangeError when the area is not positive.
 */
export function engineeringStress(forceN: DecimalInput, areaMm2: DecimalInput, decimals = 2): string {
  const area = toDecimal(areaMm2);
  if (area.lte(0)) throw new RangeError('the area must be greater than zero');
  return roundHalfEven(toDecimal(forceN).div(area), decimals);
}

/**
 * The force that produces a given stress over an area: N = MPa × mm².
 *
 * @param stressMpa - Stress in MPa.
 * @param areaMm2 - Area in mm².
 * @param decimals - Decimal places of the result, 1 by default.
 * @returns The force in N as a decimal string, rounded half to even.
 */
export function forceFromStress(stressMpa: DecimalInput, areaMm2: DecimalInput, decimals = 1): string {
  return roundHalfEven(toDecimal(stressMpa).mul(toDecimal(areaMm2)), decimals);
}

/**
 * The proportional gauge length L0 = k·√S0 (ISO 6892-1: k = 5.65, which is 5d for a round
 * specimen; 11.3 for long specimens).
 *
 * @param s0 - Original cross-section area in mm².
 * @param options - `coefficient` k ("5.65" by default) and `decimals` of the result (2 by default).
 * @returns L0 in mm as a decimal string, rounded half to even.
 * @throws RangeError when the area is not positive.
 */
export function proportionalGaugeLength(
  s0: DecimalInput,
  options: { coefficient?: DecimalInput; decimals?: number } = {},
): string {
  const area = toDecimal(s0);
  if (area.lte(0)) throw new RangeError('the area must be greater than zero');
  const k = toDecimal(options.coefficient ?? '5.65');
  return roundHalfEven(k.mul(area.sqrt()), options.decimals ?? 2);
}

/** Where a reading lies relative to nominal ± tolerance (the limits count as within). */
export type ReadingStatus = 'within' | 'below' | 'above';

/**
 * Compares one reading with a nominal size and its tolerance; the limits themselves are within.
 *
 * @param value - The reading, mm.
 * @param nominal - The nominal size, mm.
 * @param tolerance - The permitted deviation either way, mm (non-negative).
 */
export function checkReading(value: DecimalInput, nominal: DecimalInput, tolerance: DecimalInput): ReadingStatus {
  const v = toDecimal(value);
  const n = toDecimal(nominal);
  const tol = toDecimal(tolerance);
  if (tol.lt(0)) throw new RangeError('a tolerance cannot be negative');
  if (v.lt(n.minus(tol))) return 'below';
  if (v.gt(n.plus(tol))) return 'above';
  return 'within';
}

/** One reading outside what the geometry allows. */
export interface ReadingIssue {
  readonly dimension: 'width' | 'thickness' | 'diameter';
  /** Zero-based position of the reading. */
  readonly index: number;
  readonly value: string;
  readonly status: 'below' | 'above';
  /** What was allowed, e.g. "12.5 ± 0.2 mm" or "at most 19 mm". */
  readonly allowed: string;
  /** A sentence for the person measuring. */
  readonly message: string;
}

const DIMENSION_NAME = { width: 'Width', thickness: 'Thickness', diameter: 'Diameter' } as const;

function toleranceIssues(
  dimension: 'width' | 'diameter',
  values: readonly string[],
  nominal: string,
  tolerance: string,
): ReadingIssue[] {
  const allowed = `${nominal} ± ${tolerance} mm`;
  return values.flatMap((value, index) => {
    const status = checkReading(value, nominal, tolerance);
    if (status === 'within') return [];
    const where = status === 'below' ? 'below' : 'above';
    return [
      {
        dimension,
        index,
        value,
        status,
        allowed,
        message: `${DIMENSION_NAME[dimension]} reading ${index + 1} (${value} mm) is ${where} ${allowed}.`,
      },
    ];
  });
}

/**
 * Lists every reading outside the geometry's tolerance (width or diameter) or above its
 * maximum thickness. Sizes the geometry's table leaves open (null) are not checked.
 *
 * @param geometry - The specimen's geometry.
 * @param readings - Readings of the same shape, mm.
 * @returns The out-of-tolerance readings; empty when all are within.
 * @throws RangeError when the readings' shape differs from the geometry's, or a reading is not a positive decimal.
 */
export function checkReadings(geometry: SpecimenGeometry, readings: Readings): ReadingIssue[] {
  const mismatch = () =>
    new RangeError(`${geometry.label} is a ${geometry.shape} geometry but the readings are ${readings.shape}`);
  if (readings.shape === 'round') {
    if (geometry.shape !== 'round') throw mismatch();
    positiveReadings(readings.diameter, 'diameter');
    const { nominal, tolerance } = geometry.diameter;
    return tolerance === null ? [] : toleranceIssues('diameter', readings.diameter, nominal, tolerance);
  }
  if (geometry.shape !== 'flat') throw mismatch();
  positiveReadings(readings.width, 'width');
  positiveReadings(readings.thickness, 'thickness');
  const { nominal, tolerance } = geometry.width;
  const issues = tolerance === null ? [] : toleranceIssues('width', readings.width, nominal, tolerance);
  const max = geometry.maxThickness;
  if (max !== null) {
    readings.thickness.forEach((value, index) => {
      if (toDecimal(value).gt(max)) {
        issues.push({
          dimension: 'thickness',
          index,
          value,
          status: 'above',
          allowed: `at most ${max} mm`,
          message: `Thickness reading ${index + 1} (${value} mm) is above the ${max} mm maximum.`,
        });
      }
    });
  }
  return issues;
}

/**
 * Why a reading string is not acceptable, in words a person can act on, or null when it is
 * a positive decimal number of millimetres.
 *
 * @param value - The reading as typed or received.
 */
export function readingProblem(value: string): string | null {
  const text = value.trim();
  if (text === '') return 'Enter a reading.';
  if (/^\d+,\d+$/.test(text)) return `Use a decimal point, not a comma: ${text.replace(',', '.')}.`;
  if (text.length > 20 || !/^\d+(\.\d+)?$/.test(text)) {
    return 'Enter the reading as a number of millimetres, such as 12.52.';
  }
  if (toDecimal(text).lte(0)) return 'A reading must be greater than zero.';
  return null;
}

const ReadingSchema = z
  .string({ error: 'Enter the reading as a number of millimetres, such as 12.52.' })
  .superRefine((value, ctx) => {
    const problem = readingProblem(value);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  })
  .transform((value) => value.trim());

const threeReadings = (dimension: string) =>
  z.array(ReadingSchema).length(3, { error: `Enter three ${dimension} readings.` });

const OutOfToleranceReasonSchema = z
  .string()
  .trim()
  .min(1, { error: 'Say why the specimen is used although a reading is out of tolerance.' })
  .max(500, { error: 'Keep the reason under 500 characters.' });

/** A flat specimen's measurement: three widths and three thicknesses, mm. */
export const FlatMeasurementSchema = z.object({
  shape: z.literal('flat'),
  width: threeReadings('width'),
  thickness: threeReadings('thickness'),
  outOfToleranceReason: OutOfToleranceReasonSchema.optional(),
});

/** A round specimen's measurement: three diameters, mm. */
export const RoundMeasurementSchema = z.object({
  shape: z.literal('round'),
  diameter: threeReadings('diameter'),
  outOfToleranceReason: OutOfToleranceReasonSchema.optional(),
});

/** A measurement payload of either shape. */
export const MeasurementPayloadSchema = z.discriminatedUnion('shape', [FlatMeasurementSchema, RoundMeasurementSchema], {
  error: 'Say whether the specimen is flat or round.',
});

/** A parsed measurement payload. */
export type MeasurementPayload = z.infer<typeof MeasurementPayloadSchema>;

/** One of the area policies. */
export const AreaPolicySchema = z.enum(AREA_POLICIES, { error: 'Choose an area policy from the list.' });
