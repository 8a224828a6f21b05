/**
 * Request bodies and answers of the results routes: hand-entered results, the raw record upload's
 * column mapping, and the view of one specimen's results with its chart and verdict.
 */
import { z } from 'zod';
import type { DeterminedResult, PropertyResult, RoundingRules, TensileProblem, TensileProperty } from '../domain/tensile/compute';
import type { SpecimenVerdict } from '../domain/tensile/specifications';

const DECIMAL = /^[+-]?\d{1,9}(\.\d{1,9})?$/;

/** A positive decimal entered by hand, kept as text so it stays exact. */
const positive = (what: string) =>
  z
    .union([z.string(), z.number()], { error: `Enter ${what} as a number.` })
    .transform((v) => String(v).trim())
    .refine((v) => DECIMAL.test(v), { error: `Enter ${what} as a number, such as 12.50.` })
    .refine((v) => Number(v) > 0, { error: `${what[0]?.toUpperCase() ?? ''}${what.slice(1)} must be greater than zero.` });

/** Where the original gauge length L0 comes from. */
export const GAUGE_LENGTH_BASES = ['geometry', 'proportional', 'entered'] as const;
/** One of them. */
export type GaugeLengthBasis = (typeof GAUGE_LENGTH_BASES)[number];

/** The smallest cross-section after fracture, as measured: flat (width × thickness) or round (diameter). */
export const FinalSectionSchema = z.discriminatedUnion('shape', [
  z.object({ shape: z.literal('flat'), widthMm: positive('the final width'), thicknessMm: positive('the final thickness') }),
  z.object({ shape: z.literal('round'), diameterMm: positive('the final diameter') }),
]);
/** A final section. */
export type FinalSection = z.infer<typeof FinalSectionSchema>;

/**
 * POST /api/results/specimens/:code: the values entered by hand; anything left out is taken from
 * the instrument's `tested` event when it posted one. Results are computed on the server.
 */
export const ResultsEntrySchema = z
  .object({
    maxForceN: positive('the maximum force').optional(),
    finalGaugeLengthMm: positive('the final gauge length').optional(),
    /** Su in mm² directly, or the final section's dimensions. */
    finalAreaMm2: positive('the final cross-section').optional(),
    finalSection: FinalSectionSchema.optional(),
    originalGaugeLength: z
      .object({
        basis: z.enum(GAUGE_LENGTH_BASES, { error: 'Choose where L0 comes from: the geometry, proportional (5.65·√S0) or entered.' }),
        valueMm: positive('the original gauge length').optional(),
      })
      .refine((g) => g.basis !== 'entered' || g.valueMm !== undefined, { error: 'Enter L0 in mm.', path: ['valueMm'] })
      .default({ basis: 'geometry' }),
    /** A raw record uploaded earlier for this specimen. */
    rawRecordId: z.coerce.number().int().positive().optional(),
    /** The material family whose typical modulus the fitted slope is checked against. */
    material: z.enum(['steel', 'aluminium']).optional(),
    /** The stress window of the elastic fit, as fractions of the maximum stress. */
    elasticWindow: z
      .object({ lower: z.number().min(0).max(0.9), upper: z.number().min(0.05).max(1) })
      .refine((w) => w.lower < w.upper, { error: 'The window’s lower bound must be below its upper bound.', path: ['upper'] })
      .optional(),
    note: z.string().trim().max(500).optional(),
  })
  .refine((b) => !(b.finalAreaMm2 !== undefined && b.finalSection !== undefined), {
    error: 'Give the final cross-section once: either its area or its dimensions.',
    path: ['finalSection'],
  });
/** The entry. */
export type ResultsEntry = z.input<typeof ResultsEntrySchema>;

/**
 * POST /api/results/specimens/:code/records?…: the CSV is the request body (text/csv); the query
 * names the columns and their units. Units are checked by the record reader so that an unknown
 * unit gets its own message.
 */
export const RecordUploadQuerySchema = z.object({
  force: z.string().trim().min(1, { error: 'Choose the column that holds the force; a record without force cannot be used.' }),
  extension: z.string().trim().min(1, { error: 'Choose the column that holds the extension.' }),
  time: z.string().trim().optional(),
  forceUnit: z.string().trim().default('N'),
  extensionUnit: z.string().trim().default('mm'),
  gaugeLength: z.string().trim().min(1, { error: 'Enter the extensometer gauge length.' }),
  gaugeLengthUnit: z.string().trim().default('mm'),
  delimiter: z.enum([',', ';', 'tab']).optional(),
  headerRow: z.coerce.number().int().min(1).max(1000).optional(),
  decimalMark: z.enum(['.', ',']).optional(),
  fileName: z.string().trim().max(200).optional(),
});
/** The upload's query. */
export type RecordUploadQuery = z.infer<typeof RecordUploadQuerySchema>;

/** Largest raw record accepted, bytes. */
export const MAX_RECORD_BYTES = 32 * 1024 * 1024;

/** A stored raw record, as the API shows it. */
export interface RawRecordView {
  id: number;
  sha256: string;
  sizeBytes: number;
  fileName: string | null;
  pointCount: number;
  columns: { time?: string; force: string; extension: string };
  units: { force: string; extension: string };
  extensometerGaugeLengthMm: string;
  createdAt: string;
}

/** Values an instrument posted with the `tested` event. */
export const TestedResultsPayloadSchema = z.looseObject({
  maxForceN: z.union([z.number(), z.string()]).optional(),
  finalGaugeLengthMm: z.union([z.number(), z.string()]).optional(),
  finalAreaMm2: z.union([z.number(), z.string()]).optional(),
});

/** What the results were computed from. */
export interface ResultsInputs {
  s0Mm2: string;
  s0Basis: string;
  measuredEvent: string;
  testedEvent: string;
  maxForceN: { value: string; from: 'entered' | 'instrument' } | null;
  originalGaugeLength: { valueMm: string; basis: GaugeLengthBasis };
  finalGaugeLengthMm: { value: string; from: 'entered' | 'instrument' } | null;
  finalAreaMm2: { value: string; from: 'entered' | 'instrument'; section?: FinalSection } | null;
  rawRecord: { id: number; sha256: string; pointCount: number; extensometerGaugeLengthMm: string } | null;
  material: 'steel' | 'aluminium' | null;
  elasticWindow: { lower: number; upper: number } | null;
  note: string | null;
}

/** The stored results: per property, the warnings, and the rounding applied. */
export interface StoredResults {
  properties: Record<TensileProperty, PropertyResult>;
  warnings: TensileProblem[];
  rounding: RoundingRules;
  originalGaugeLengthMm: string | null;
  /** The fitted elastic line, when there was a record. */
  elastic: { slopeMPa: number; interceptMPa: number; pointCount: number; rSquared: number } | null;
}

/** The chart of one specimen: thinned curve in strain % and MPa, the offset line and marked points. */
export interface ChartView {
  points: { strainPct: number; stressMPa: number }[];
  offsetLine: { strainPct: number; stressMPa: number }[];
  marks: { key: 'rp02' | 'rm' | 'reh'; label: string; strainPct: number; stressMPa: number; value: string }[];
  originalPointCount: number;
}

/** The order's specification as found, or why none applies. */
export type SpecResolution =
  | { status: 'found'; key: string; name: string; source: string; how: 'material-spec' | 'chosen' }
  | { status: 'none'; reason: string };

/** GET /api/results/specimens/:code. */
export interface SpecimenResultsView {
  specimen: {
    code: string;
    state: string;
    shape: 'flat' | 'round';
    geometryKey: string;
    geometryLabel: string | null;
    heatNumber: string;
    sampleCode: string;
    sampleThicknessMm: string | null;
    orderId: number;
    orderNumber: string;
    materialSpec: string;
  };
  measurement: { s0Mm2: string; basis: string; readings: Record<string, string[]>; event: string } | null;
  tested: { event: string; fractured: boolean; instrument: { maxForceN?: string; finalGaugeLengthMm?: string; finalAreaMm2?: string } } | null;
  gaugeLengthOffers: { geometryMm: string | null; proportionalMm: string | null };
  current: {
    id: number;
    createdAt: string;
    enteredBy: string;
    inputs: ResultsInputs;
    results: StoredResults;
    /** Strengths shown in ksi as well (converted exactly, rounded once). */
    ksi: Partial<Record<TensileProperty, string>>;
  } | null;
  history: { id: number; createdAt: string; enteredBy: string }[];
  rawRecords: RawRecordView[];
  chart: ChartView | null;
  specification: SpecResolution;
  verdict: SpecimenVerdict | null;
  canWrite: boolean;
}

/** Narrows a property result to a determined one. */
export function isDetermined(result: PropertyResult | undefined): result is DeterminedResult {
  return result?.status === 'determined';
}
