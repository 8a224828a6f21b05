/**
 * Specification limits for tensile results, each row naming its source, and the judgement of
 * a specimen's results against them.
 *
 * Limits are compared in the specification's own units: ASTM's dual-unit standards give their
 * SI limits as values of their own, not conversions (36 ksi is 248.2 MPa, but the SI limit is
 * 250 MPa), so a ksi limit is compared in ksi and an MPa limit in MPa. Before comparing, the
 * result is rounded to the row's comparison increment by the ASTM E29 rounding method (half to
 * even, one step), as the standards ask for (see each row's note for where that increment comes from).
 *
 * Provenance: the limits were read in secondary copies that cite the standards [copy]; where
 * a row adds something recalled (thickness bands, comparison increments), the row says so [memory].
 * A lab should confirm every row against its own copy of the standard before relying on it.
 */
import { z } from 'zod';
import type Decimal from 'decimal.js';
import { type DecimalInput, roundToIncrement, toDecimal } from '../decimal-rounding';
import { MM_PER_INCH, fromSI } from '../units';
import type { PropertyResult, TensileProperty, TensileResults } from './compute';

/** Properties a specification limits. */
export const LIMIT_PROPERTIES = ['tensileStrength', 'yieldStrength', 'elongation', 'reductionOfArea'] as const;
/** One of them. */
export type LimitProperty = (typeof LIMIT_PROPERTIES)[number];

/** Words for each limited property. */
export const LIMIT_PROPERTY_NAME: Readonly<Record<LimitProperty, string>> = {
  tensileStrength: 'tensile strength',
  yieldStrength: 'yield strength',
  elongation: 'elongation after fracture',
  reductionOfArea: 'reduction of area',
};

/**
 * Which result a yield limit is judged on: 'upper-or-offset' takes the upper yield strength ReH
 * where the curve shows a yield drop and the 0.2 % offset yield strength Rp0.2 otherwise;
 * 'offset' always takes Rp0.2.
 */
export const YIELD_MEASURES = ['upper-or-offset', 'offset'] as const;
/** One of them. */
export type YieldMeasure = (typeof YIELD_MEASURES)[number];

const DECIMAL = /^\d{1,6}(\.\d{1,6})?$/;
const decimalText = (what: string) =>
  z
    .string({ error: `Enter ${what} as a number, such as 355 or 42.0.` })
    .trim()
    .regex(DECIMAL, { error: `Enter ${what} as a number with a decimal point, such as 355 or 42.0.` });

const positiveDecimal = (what: string) =>
  decimalText(what).refine((v) => toDecimal(v).gt(0), { error: `${what[0]?.toUpperCase() ?? ''}${what.slice(1)} must be greater than zero.` });

/** A product-thickness band; bounds in its unit, `over` exclusive, `from` and `upTo` inclusive. */
export const ThicknessBandSchema = z
  .object({
    unit: z.enum(['mm', 'in'], { error: 'Choose mm or in for the thickness band.' }),
    over: decimalText('the lower bound').optional(),
    from: decimalText('the lower bound').optional(),
    upTo: decimalText('the upper bound').optional(),
    /** Round the nominal thickness to this step, in the band's unit, before placing it (e.g. 0.001 in). */
    roundTo: positiveDecimal('the thickness rounding step').optional(),
  })
  .superRefine((band, ctx) => {
    if (band.over !== undefined && band.from !== undefined) {
      ctx.addIssue({ code: 'custom', path: ['from'], message: 'Give the lower bound once: either "over" or "from".' });
    }
    const lower = band.over ?? band.from;
    if (lower === undefined && band.upTo === undefined) {
      ctx.addIssue({ code: 'custom', path: ['upTo'], message: 'A thickness band needs a lower bound, an upper bound, or both.' });
    }
    if (lower !== undefined && band.upTo !== undefined && toDecimal(lower).gte(band.upTo)) {
      ctx.addIssue({ code: 'custom', path: ['upTo'], message: 'The upper bound must be above the lower bound.' });
    }
  });

/** A product-thickness band. */
export type ThicknessBand = z.infer<typeof ThicknessBandSchema>;

/** One limit of a specification. Strength limits are in the specification's strength unit; elongation and Z in %. */
export const SpecLimitSchema = z
  .object({
    property: z.enum(LIMIT_PROPERTIES, { error: 'Choose the property the limit applies to.' }),
    min: decimalText('the minimum').optional(),
    max: decimalText('the maximum').optional(),
    thickness: ThicknessBandSchema.optional(),
    /** For elongation: the gauge length the limit is given for. */
    gaugeLength: z.object({ value: positiveDecimal('the gauge length'), unit: z.enum(['mm', 'in']) }).optional(),
    /** The result is rounded to this step, in the limit's unit, before it is compared. */
    comparisonIncrement: positiveDecimal('the comparison step'),
    note: z.string().trim().max(500).optional(),
  })
  .superRefine((limit, ctx) => {
    if (limit.min === undefined && limit.max === undefined) {
      ctx.addIssue({ code: 'custom', path: ['min'], message: 'Give a minimum, a maximum, or both.' });
    }
    if (limit.min !== undefined && limit.max !== undefined && toDecimal(limit.min).gt(limit.max)) {
      ctx.addIssue({ code: 'custom', path: ['max'], message: 'The maximum must not be below the minimum.' });
    }
    const percentage = limit.property === 'elongation' || limit.property === 'reductionOfArea';
    for (const key of ['min', 'max'] as const) {
      const v = limit[key];
      if (percentage && v !== undefined && toDecimal(v).gt(100)) {
        ctx.addIssue({ code: 'custom', path: [key], message: 'A percentage cannot be above 100.' });
      }
    }
    if (limit.gaugeLength !== undefined && limit.property !== 'elongation') {
      ctx.addIssue({ code: 'custom', path: ['gaugeLength'], message: 'Only an elongation limit names a gauge length.' });
    }
  });

/** One limit of a specification. */
export type SpecLimit = z.infer<typeof SpecLimitSchema>;

/** The thickness interval of a band in mm, for overlap checks. */
function bandInMm(band: ThicknessBand | undefined): { lo: Decimal | null; loOpen: boolean; hi: Decimal | null } {
  const factor = band?.unit === 'in' ? MM_PER_INCH : '1';
  const lower = band?.over ?? band?.from;
  return {
    lo: lower === undefined ? null : toDecimal(lower).mul(factor),
    loOpen: band?.over !== undefined,
    hi: band?.upTo === undefined ? null : toDecimal(band.upTo).mul(factor),
  };
}

function bandsOverlap(a: ThicknessBand | undefined, b: ThicknessBand | undefined): boolean {
  const x = bandInMm(a);
  const y = bandInMm(b);
  // Two intervals are apart when one ends before the other starts (an open start at the other's end counts as apart).
  const apart = (first: typeof x, second: typeof y) =>
    first.hi !== null && second.lo !== null && (first.hi.lt(second.lo) || (first.hi.eq(second.lo) && second.loOpen));
  return !apart(x, y) && !apart(y, x);
}

function sameGauge(a: SpecLimit['gaugeLength'], b: SpecLimit['gaugeLength']): boolean {
  if (a === undefined || b === undefined) return a === b;
  return toDecimal(a.value).mul(a.unit === 'in' ? MM_PER_INCH : '1').eq(toDecimal(b.value).mul(b.unit === 'in' ? MM_PER_INCH : '1'));
}

/**
 * A specification as a manager enters it through the form: the designation, the grade, the
 * strength unit its limits are in, which yield result it limits, where the values were read,
 * and its limits. The same schema checks the request on the server.
 */
export const SpecificationInputSchema = z
  .object({
    key: z
      .string()
      .trim()
      .regex(/^[a-z0-9]+(-[a-z0-9]+)*$/, { error: 'Use lower-case letters, digits and hyphens, such as en10025-2-s275jr.' })
      .max(60, { error: 'Keep the key under 60 characters.' }),
    designation: z.string().trim().min(1, { error: 'Enter the standard, such as EN 10025-2:2019.' }).max(100),
    grade: z.string().trim().min(1, { error: 'Enter the grade, such as S275JR.' }).max(60),
    strengthUnit: z.enum(['MPa', 'ksi'], { error: 'Choose the unit the strength limits are written in: MPa or ksi.' }),
    yieldMeasure: z.enum(YIELD_MEASURES, { error: 'Choose which yield result the yield limit applies to.' }),
    source: z
      .string()
      .trim()
      .min(3, { error: 'Say where the limits were read: the standard, its edition and the table.' })
      .max(300),
    notes: z.string().trim().max(1000).optional(),
    limits: z.array(SpecLimitSchema).min(1, { error: 'Add at least one limit.' }).max(50),
  })
  .superRefine((spec, ctx) => {
    spec.limits.forEach((a, i) => {
      spec.limits.slice(0, i).forEach((b, j) => {
        if (a.property === b.property && sameGauge(a.gaugeLength, b.gaugeLength) && bandsOverlap(a.thickness, b.thickness)) {
          ctx.addIssue({
            code: 'custom',
            path: ['limits', i, 'thickness'],
            message: `This ${LIMIT_PROPERTY_NAME[a.property]} limit overlaps limit ${j + 1}; give each thickness band once.`,
          });
        }
      });
    });
  });

/** A specification as entered. */
export type SpecificationInput = z.infer<typeof SpecificationInputSchema>;

/** A specification with how its values were obtained: read in the standard, in a copy citing it, or entered by a lab. */
export interface Specification extends SpecificationInput {
  readonly provenance: 'doc' | 'copy' | 'entered';
}

// Comparison increments for ASTM A36 and A572 follow ASTM A6/A6M's rounding clause as recalled
// [memory]: strength to the nearest 1 ksi [5 MPa], elongation to the nearest 1 %.
const A6_ROUNDING_NOTE = 'Rounded before comparison as ASTM A6/A6M asks (nearest 1 ksi [5 MPa], elongation 1 %), recalled from A6/A6M, not read.';

/**
 * The built-in specifications. Limits as read in secondary copies citing each standard [copy].
 * Footnotes of the standards (elongation adjustments for thin or wide plate, shapes, other product
 * forms) are not modelled; a row's notes say what it leaves out.
 */
export const SPECIFICATIONS: readonly Specification[] = [
  {
    key: 'astm-a36',
    designation: 'ASTM A36/A36M',
    grade: 'A36 (inch-pound limits)',
    strengthUnit: 'ksi',
    yieldMeasure: 'upper-or-offset',
    source: 'ASTM A36/A36M, tension requirements for plates, shapes and bars (read in a copy citing the table)',
    provenance: 'copy',
    notes: 'Footnote adjustments of elongation (thin or wide plate, shapes) are not modelled.',
    limits: [
      { property: 'tensileStrength', min: '58', max: '80', comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'yieldStrength', min: '36', comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '20', gaugeLength: { value: '8', unit: 'in' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '23', gaugeLength: { value: '2', unit: 'in' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
    ],
  },
  {
    key: 'astm-a36m',
    designation: 'ASTM A36/A36M',
    grade: 'A36 (SI limits)',
    strengthUnit: 'MPa',
    yieldMeasure: 'upper-or-offset',
    source: 'ASTM A36/A36M, tension requirements for plates, shapes and bars, SI values (read in a copy citing the table)',
    provenance: 'copy',
    notes: 'The SI limits are values of their own (250 MPa, not 36 ksi converted). Footnote adjustments of elongation are not modelled.',
    limits: [
      { property: 'tensileStrength', min: '400', max: '550', comparisonIncrement: '5', note: A6_ROUNDING_NOTE },
      { property: 'yieldStrength', min: '250', comparisonIncrement: '5', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '20', gaugeLength: { value: '200', unit: 'mm' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '23', gaugeLength: { value: '50', unit: 'mm' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
    ],
  },
  {
    key: 'astm-a572-gr50',
    designation: 'ASTM A572/A572M',
    grade: 'Grade 50 (inch-pound limits)',
    strengthUnit: 'ksi',
    yieldMeasure: 'upper-or-offset',
    source: 'ASTM A572/A572M, tensile requirements, Grade 50 [345] (read in a copy citing the table)',
    provenance: 'copy',
    notes: 'Footnote adjustments of elongation are not modelled.',
    limits: [
      { property: 'tensileStrength', min: '65', comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'yieldStrength', min: '50', comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '18', gaugeLength: { value: '8', unit: 'in' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '21', gaugeLength: { value: '2', unit: 'in' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
    ],
  },
  {
    key: 'astm-a572m-gr345',
    designation: 'ASTM A572/A572M',
    grade: 'Grade 345 (SI limits)',
    strengthUnit: 'MPa',
    yieldMeasure: 'upper-or-offset',
    source: 'ASTM A572/A572M, tensile requirements, Grade 50 [345], SI values (read in a copy citing the table)',
    provenance: 'copy',
    notes: 'Footnote adjustments of elongation are not modelled.',
    limits: [
      { property: 'tensileStrength', min: '450', comparisonIncrement: '5', note: A6_ROUNDING_NOTE },
      { property: 'yieldStrength', min: '345', comparisonIncrement: '5', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '18', gaugeLength: { value: '200', unit: 'mm' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
      { property: 'elongation', min: '21', gaugeLength: { value: '50', unit: 'mm' }, comparisonIncrement: '1', note: A6_ROUNDING_NOTE },
    ],
  },
  {
    key: 'en10025-2-s355jr',
    designation: 'EN 10025-2',
    grade: 'S355JR',
    strengthUnit: 'MPa',
    yieldMeasure: 'upper-or-offset',
    source: 'EN 10025-2, mechanical properties at room temperature of flat and long products, S355 (read in a copy citing the table)',
    provenance: 'copy',
    notes:
      'ReH by nominal thickness as read. The 3–100 mm band of the Rm limits is recalled, not read [memory]: other thicknesses have limits of their own, so they are not judged here. Elongation limits are not in the copy read and are left out. Results are compared at 1 MPa, the ISO 6892-1 reporting step [memory].',
    limits: [
      { property: 'yieldStrength', min: '355', thickness: { unit: 'mm', upTo: '16' }, comparisonIncrement: '1' },
      { property: 'yieldStrength', min: '345', thickness: { unit: 'mm', over: '16', upTo: '40' }, comparisonIncrement: '1' },
      { property: 'yieldStrength', min: '335', thickness: { unit: 'mm', over: '40', upTo: '63' }, comparisonIncrement: '1' },
      { property: 'yieldStrength', min: '325', thickness: { unit: 'mm', over: '63', upTo: '80' }, comparisonIncrement: '1' },
      { property: 'yieldStrength', min: '315', thickness: { unit: 'mm', over: '80', upTo: '100' }, comparisonIncrement: '1' },
      { property: 'yieldStrength', min: '295', thickness: { unit: 'mm', over: '100' }, comparisonIncrement: '1' },
      {
        property: 'tensileStrength',
        min: '470',
        max: '630',
        thickness: { unit: 'mm', from: '3', upTo: '100' },
        comparisonIncrement: '1',
        note: 'Thickness band 3–100 mm recalled, not read [memory].',
      },
    ],
  },
  {
    key: 'astm-b209-6061-t6',
    designation: 'ASTM B209',
    grade: '6061-T6, 0.021–0.499 in',
    strengthUnit: 'ksi',
    yieldMeasure: 'offset',
    source: 'ASTM B209, mechanical property limits, alloy 6061, temper T6, thickness 0.021–0.499 in (read in a copy citing the table)',
    provenance: 'copy',
    notes:
      'Only the 0.021–0.499 in row is held; other thicknesses are not judged. The thickness is rounded to 0.001 in and results to the last place of each limit (ASTM E29 rounding method) before comparing [memory]. The copy read names no gauge length for the elongation limit.',
    limits: [
      { property: 'tensileStrength', min: '42.0', thickness: { unit: 'in', from: '0.021', upTo: '0.499', roundTo: '0.001' }, comparisonIncrement: '0.1' },
      { property: 'yieldStrength', min: '35.0', thickness: { unit: 'in', from: '0.021', upTo: '0.499', roundTo: '0.001' }, comparisonIncrement: '0.1' },
      { property: 'elongation', min: '10', thickness: { unit: 'in', from: '0.021', upTo: '0.499', roundTo: '0.001' }, comparisonIncrement: '1' },
    ],
  },
];

/**
 * Finds a built-in specification by key.
 *
 * @param key - e.g. 'en10025-2-s355jr'.
 */
export function getSpecification(key: string): Specification | undefined {
  return SPECIFICATIONS.find((s) => s.key === key);
}

/** The three verdicts. */
export type Verdict = 'conforms' | 'does-not-conform' | 'cannot-judge';

/** The verdict on one property. */
export interface PropertyVerdict {
  readonly property: LimitProperty;
  readonly verdict: Verdict;
  /** The limit applied, e.g. "≥ 36 ksi" or "470 to 630 MPa"; null when no limit could be chosen. */
  readonly limit: string | null;
  /** The result as compared: converted to the limit's unit and rounded to its step, e.g. "35 ksi". */
  readonly observed: string | null;
  /** The result judged, e.g. 'Rp0.2', 'ReH', 'Rm', 'A', 'Z'. */
  readonly result: string | null;
  /** A sentence for the report. */
  readonly message: string;
}

/** The verdict on a specimen: does not conform if any property does not, else cannot judge if any cannot, else conforms. */
export interface SpecimenVerdict {
  readonly specification: string;
  readonly verdict: Verdict;
  readonly properties: readonly PropertyVerdict[];
  /** A sentence for the report. */
  readonly summary: string;
}

/** What {@link judge} reads of a specimen's results. */
export type JudgeableResults = Pick<TensileResults, 'properties' | 'originalGaugeLengthMm'>;

/** The product's nominal thickness decides which thickness band applies. */
export interface JudgeContext {
  readonly thicknessMm?: DecimalInput | null;
}

/** Relative difference within which a specimen's L0 counts as a limit's gauge length (2 in and 50 mm are one gauge length in ASTM's dual-unit tables; common practice). */
export const GAUGE_LENGTH_MATCH = '0.02';

function describeLimit(limit: SpecLimit, unit: string): string {
  if (limit.min !== undefined && limit.max !== undefined) return `${limit.min} to ${limit.max} ${unit}`;
  if (limit.min !== undefined) return `≥ ${limit.min} ${unit}`;
  return `≤ ${limit.max ?? ''} ${unit}`;
}

function describeBand(band: ThicknessBand): string {
  const lower = band.over !== undefined ? `over ${band.over}` : band.from !== undefined ? `from ${band.from}` : '';
  const upper = band.upTo !== undefined ? `up to ${band.upTo}` : '';
  return `${[lower, upper].filter(Boolean).join(' ')} ${band.unit}`;
}

function inBand(band: ThicknessBand, thicknessMm: Decimal): boolean {
  let t = band.unit === 'in' ? thicknessMm.div(MM_PER_INCH) : thicknessMm;
  if (band.roundTo !== undefined) t = toDecimal(roundToIncrement(t, band.roundTo));
  if (band.over !== undefined && !t.gt(band.over)) return false;
  if (band.from !== undefined && !t.gte(band.from)) return false;
  if (band.upTo !== undefined && !t.lte(band.upTo)) return false;
  return true;
}

function gaugeMatches(limit: SpecLimit, l0Mm: Decimal): boolean {
  if (limit.gaugeLength === undefined) return true;
  const g = toDecimal(limit.gaugeLength.value).mul(limit.gaugeLength.unit === 'in' ? MM_PER_INCH : '1');
  return l0Mm.minus(g).abs().lte(g.mul(GAUGE_LENGTH_MATCH));
}

const RESULT_FOR: Readonly<Record<Exclude<LimitProperty, 'yieldStrength'>, TensileProperty>> = {
  tensileStrength: 'tensileStrength',
  elongation: 'elongation',
  reductionOfArea: 'reductionOfArea',
};

const SYMBOL: Readonly<Partial<Record<TensileProperty, string>>> = {
  tensileStrength: 'Rm',
  offsetYieldStrength: 'Rp0.2',
  upperYieldStrength: 'ReH',
  elongation: 'A',
  reductionOfArea: 'Z',
};

function chooseResult(spec: Specification, property: LimitProperty, results: JudgeableResults): { key: TensileProperty; result: PropertyResult } {
  if (property !== 'yieldStrength') {
    const key = RESULT_FOR[property];
    return { key, result: results.properties[key] };
  }
  const upper = results.properties.upperYieldStrength;
  if (spec.yieldMeasure === 'upper-or-offset' && upper.status === 'determined') return { key: 'upperYieldStrength', result: upper };
  return { key: 'offsetYieldStrength', result: results.properties.offsetYieldStrength };
}

function judgeProperty(spec: Specification, property: LimitProperty, results: JudgeableResults, thickness: Decimal | null): PropertyVerdict {
  const name = LIMIT_PROPERTY_NAME[property];
  const Name = `${name[0]?.toUpperCase() ?? ''}${name.slice(1)}`;
  const unit = property === 'elongation' || property === 'reductionOfArea' ? '%' : spec.strengthUnit;
  const cannot = (message: string, limit: string | null = null, result: string | null = null): PropertyVerdict => ({
    property,
    verdict: 'cannot-judge',
    limit,
    observed: null,
    result,
    message,
  });

  let rows = spec.limits.filter((l) => l.property === property);
  if (rows.some((l) => l.thickness !== undefined)) {
    if (thickness === null) return cannot(`${Name} cannot be judged: ${spec.designation} ${spec.grade} sets it by product thickness, and no nominal thickness was given.`);
    rows = rows.filter((l) => l.thickness === undefined || inBand(l.thickness, thickness));
    if (rows.length === 0) {
      const bands = spec.limits.flatMap((l) => (l.property === property && l.thickness ? [describeBand(l.thickness)] : []));
      return cannot(`${Name} cannot be judged: the table holds no limit for a nominal thickness of ${thickness.toString()} mm (it covers ${bands.join('; ')}).`);
    }
  }
  if (rows.some((l) => l.gaugeLength !== undefined)) {
    const l0 = results.originalGaugeLengthMm;
    if (l0 === null) return cannot(`${Name} cannot be judged: the limit depends on the gauge length, and no original gauge length L0 was given.`);
    const l0Mm = toDecimal(l0);
    const matching = rows.filter((l) => gaugeMatches(l, l0Mm));
    if (matching.length === 0) {
      const lengths = rows.flatMap((l) => (l.gaugeLength ? [`${l.gaugeLength.value} ${l.gaugeLength.unit}`] : []));
      return cannot(`${Name} cannot be judged: ${spec.designation} gives limits for gauge lengths of ${lengths.join(' and ')}, and this specimen's L0 is ${l0} mm.`);
    }
    rows = matching;
  }
  const [limit] = rows;
  if (limit === undefined) return cannot(`${Name} has no limit in ${spec.designation} ${spec.grade}.`);
  const limitText = describeLimit(limit, unit);

  const { key, result } = chooseResult(spec, property, results);
  const symbol = SYMBOL[key] ?? key;
  if (result.status !== 'determined') return cannot(`${Name} cannot be judged: ${symbol} was not determined. ${result.reason}`, limitText, symbol);

  const full = unit === 'ksi' ? fromSI(result.unrounded, 'ksi') : toDecimal(result.unrounded);
  const compared = roundToIncrement(full, limit.comparisonIncrement);
  const observed = `${compared} ${unit}`;
  const below = limit.min !== undefined && toDecimal(compared).lt(limit.min);
  const above = limit.max !== undefined && toDecimal(compared).gt(limit.max);
  if (below || above) {
    const bound = below ? `minimum ${limit.min ?? ''} ${unit}` : `maximum ${limit.max ?? ''} ${unit}`;
    return {
      property,
      verdict: 'does-not-conform',
      limit: limitText,
      observed,
      result: symbol,
      message: `${Name} (${symbol}) ${observed} is ${below ? 'below' : 'above'} the ${bound}.`,
    };
  }
  return { property, verdict: 'conforms', limit: limitText, observed, result: symbol, message: `${Name} (${symbol}) ${observed} meets ${limitText}.` };
}

/**
 * Judges one specimen's results against a specification, property by property, in the
 * specification's own units.
 *
 * @param spec - The specification.
 * @param results - The specimen's results (from computeTensile).
 * @param context - The product's nominal thickness in mm, for limits set by thickness.
 * @returns A verdict per limited property (conforms, does not conform, or cannot judge and why)
 *   and for the specimen as a whole.
 */
export function judge(spec: Specification, results: JudgeableResults, context: JudgeContext = {}): SpecimenVerdict {
  let thickness: Decimal | null = null;
  if (context.thicknessMm !== null && context.thicknessMm !== undefined && context.thicknessMm !== '') {
    try {
      const t = toDecimal(context.thicknessMm);
      thickness = t.gt(0) ? t : null;
    } catch {
      thickness = null;
    }
  }
  const properties = LIMIT_PROPERTIES.filter((p) => spec.limits.some((l) => l.property === p)).map((p) =>
    judgeProperty(spec, p, results, thickness),
  );
  const name = `${spec.designation} ${spec.grade}`;
  const failing = properties.filter((p) => p.verdict === 'does-not-conform');
  const open = properties.filter((p) => p.verdict === 'cannot-judge');
  if (failing.length > 0) {
    return { specification: spec.key, verdict: 'does-not-conform', properties, summary: `Does not conform to ${name}: ${failing.map((p) => p.message).join(' ')}` };
  }
  if (open.length > 0) {
    return { specification: spec.key, verdict: 'cannot-judge', properties, summary: `Cannot be judged against ${name}: ${open.map((p) => p.message).join(' ')}` };
  }
  return { specification: spec.key, verdict: 'conforms', properties, summary: `Conforms to ${name}.` };
}
