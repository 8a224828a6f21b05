/** Samples: a piece of one heat received for one order. Request bodies, list query and API shape. */
import { z } from 'zod';
import { filterParam, idField, listQuerySchema, requiredText } from './intake-common';

/** Orientations the forms suggest; any short text is accepted, as labs name them their own way. */
export const ORIENTATION_SUGGESTIONS = ['longitudinal', 'transverse', 'through-thickness'] as const;

/**
 * A thickness in mm: a positive decimal with at most three places, as stored; from JSON or a form.
 * Kept as a decimal string so no binary rounding enters it.
 */
export const ThicknessMmSchema = z.preprocess(
  (v) => (typeof v === 'number' && Number.isFinite(v) ? String(v) : typeof v === 'string' && v.trim() === '' ? null : v),
  z
    .string()
    .trim()
    .regex(/^\d{1,7}(\.\d{1,3})?$/, { message: 'Thickness is a number of mm with at most three decimals, e.g. 6.35.' })
    .refine((s) => Number(s) > 0, { message: 'Thickness must be more than 0 mm.' })
    .nullable(),
);

const sampleFields = {
  position: requiredText(200, 'Say where on the product the sample was taken, e.g. head end, mid-width.'),
  orientation: requiredText(60, 'Enter the orientation, e.g. longitudinal or transverse.'),
  thicknessMm: ThicknessMmSchema.optional(),
};

/** POST /api/samples */
export const SampleCreateSchema = z.object({
  orderId: idField('Choose the order the sample was received for.'),
  heatId: idField('Choose the heat the sample comes from.'),
  ...sampleFields,
});
export type SampleCreate = z.infer<typeof SampleCreateSchema>;

/** PATCH /api/samples/:id: where it was taken and how; its order and heat stay. */
export const SampleUpdateSchema = z.object(sampleFields).partial();
export type SampleUpdate = z.infer<typeof SampleUpdateSchema>;

export const SAMPLE_SORTS = ['code', 'createdAt', 'heat', 'order'] as const;

/** GET /api/samples: search, sort, paging, filters by order and heat. */
export const SampleListQuerySchema = listQuerySchema(SAMPLE_SORTS, '-createdAt').extend({
  orderId: filterParam(idField('Filter by an order id.')),
  heatId: filterParam(idField('Filter by a heat id.')),
});
export type SampleListQuery = z.infer<typeof SampleListQuerySchema>;

/** A sample as the API shows it. */
export interface SampleView {
  id: number;
  code: string;
  orderId: number;
  orderNumber: string;
  heatId: number;
  heatNumber: string;
  position: string;
  orientation: string;
  thicknessMm: string | null;
  specimenCount: number;
  createdAt: string;
}

/** GET /api/samples/:id: the sample with its specimens. */
export interface SampleDetail extends SampleView {
  customerName: string;
  grade: string;
  specimens: { id: number; code: string; state: string; geometryKey: string; shape: string }[];
  canWrite: boolean;
}
