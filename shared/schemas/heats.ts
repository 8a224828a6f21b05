/** Heats (or lots): the melt a sample comes from. Request bodies, list query and API shape. */
import { z } from 'zod';
import { filterParam, idField, listQuerySchema, optionalText, requiredText } from './intake-common';

/** POST /api/heats */
export const HeatCreateSchema = z.object({
  heatNumber: requiredText(60, 'Enter the heat (or lot) number as the producer marks it.'),
  material: requiredText(120, 'Enter the material, e.g. carbon steel plate.'),
  grade: requiredText(120, 'Enter the grade, e.g. A36 or 6061-T6.'),
  producer: requiredText(200, 'Enter the producer (mill or moulder).'),
  certificateRef: optionalText(120),
});
export type HeatCreate = z.infer<typeof HeatCreateSchema>;

/** PATCH /api/heats/:id */
export const HeatUpdateSchema = HeatCreateSchema.partial();
export type HeatUpdate = z.infer<typeof HeatUpdateSchema>;

export const HEAT_SORTS = ['heatNumber', 'producer', 'grade', 'createdAt'] as const;

/** GET /api/heats: search, sort, paging, and the order a heat is on. */
export const HeatListQuerySchema = listQuerySchema(HEAT_SORTS, '-createdAt').extend({
  orderId: filterParam(idField('Filter by an order id.')),
});
export type HeatListQuery = z.infer<typeof HeatListQuerySchema>;

/** A heat as the API shows it. */
export interface HeatView {
  id: number;
  heatNumber: string;
  material: string;
  grade: string;
  producer: string;
  certificateRef: string | null;
  orderCount: number;
  specimenCount: number;
  createdAt: string;
}

/** GET /api/heats/:id: the heat with the orders it is on and its samples. */
export interface HeatDetail extends HeatView {
  orders: { id: number; number: string; customerName: string; status: string }[];
  samples: { id: number; code: string; orderId: number; orderNumber: string; position: string; orientation: string; specimenCount: number }[];
  canWrite: boolean;
}
