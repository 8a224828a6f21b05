/** Specimens: machined from a sample, each an item with a code and a chain of custody. */
import { z } from 'zod';
import { codeSchemaFor } from '../domain/codes';
import { PIECE_STATES } from '../domain/ledger/state-machine';
import { GeometryKeySchema, type SpecimenGeometry, type ToleratedSize } from '../domain/specimen-geometries';
import { filterParam, idField, listQuerySchema, optionalText } from './intake-common';

/** POST /api/specimens: geometry and standard default to the order's. */
export const SpecimenCreateSchema = z.object({
  sampleId: idField('Choose the sample this specimen is cut from: every specimen belongs to a sample.'),
  geometryKey: GeometryKeySchema.optional(),
  testStandard: optionalText(100),
});
export type SpecimenCreate = z.infer<typeof SpecimenCreateSchema>;

/** PATCH /api/specimens/:id: the plan may change until the specimen is cut. */
export const SpecimenUpdateSchema = z.object({
  geometryKey: GeometryKeySchema.optional(),
  testStandard: optionalText(100),
});
export type SpecimenUpdate = z.infer<typeof SpecimenUpdateSchema>;

/** A specimen code in a URL or a search: display or compact form, check character verified. */
export const SpecimenCodeSchema = codeSchemaFor('specimen');

export const SPECIMEN_SORTS = ['code', 'state', 'createdAt', 'heat', 'order'] as const;

/** GET /api/specimens: search, sort, paging, filters by order, heat, sample, state and shape. */
export const SpecimenListQuerySchema = listQuerySchema(SPECIMEN_SORTS, '-code').extend({
  orderId: filterParam(idField('Filter by an order id.')),
  heatId: filterParam(idField('Filter by a heat id.')),
  sampleId: filterParam(idField('Filter by a sample id.')),
  state: filterParam(z.enum(PIECE_STATES, { error: 'Filter by a specimen state from the list.' })),
  shape: filterParam(z.enum(['flat', 'round'], { error: 'Shape is flat or round.' })),
});
export type SpecimenListQuery = z.infer<typeof SpecimenListQuerySchema>;

/** The nominal sizes a specimen is machined to, copied from its geometry row when registered. */
export type SpecimenNominal =
  | {
      shape: 'flat';
      width: ToleratedSize;
      gaugeLength: ToleratedSize;
      maxThickness: string | null;
      /** The sample's thickness in mm, when known: flat specimens keep the product's thickness. */
      thickness: string | null;
      standard: string;
      source: string;
    }
  | { shape: 'round'; diameter: ToleratedSize; gaugeLength: ToleratedSize; standard: string; source: string };

/**
 * The nominal sizes of a specimen of one geometry, with the row's source named beside them.
 *
 * @param geometry - The geometry row.
 * @param thicknessMm - The sample's thickness in mm (flat specimens), or null when unknown.
 */
export function nominalFor(geometry: SpecimenGeometry, thicknessMm: string | null): SpecimenNominal {
  if (geometry.shape === 'flat') {
    return {
      shape: 'flat',
      width: geometry.width,
      gaugeLength: geometry.gaugeLength,
      maxThickness: geometry.maxThickness,
      thickness: thicknessMm,
      standard: geometry.standard,
      source: geometry.source,
    };
  }
  return { shape: 'round', diameter: geometry.diameter, gaugeLength: geometry.gaugeLength, standard: geometry.standard, source: geometry.source };
}

/** A specimen as the API shows it. */
export interface SpecimenView {
  id: number;
  code: string;
  state: string;
  shape: 'flat' | 'round';
  geometryKey: string;
  testStandard: string;
  sampleId: number;
  sampleCode: string;
  heatId: number;
  heatNumber: string;
  orderId: number;
  orderNumber: string;
  createdAt: string;
}

/** GET /api/specimens/:idOrCode */
export interface SpecimenDetail extends SpecimenView {
  nominal: SpecimenNominal;
  geometryLabel: string | null;
  position: string;
  orientation: string;
  customerName: string;
  grade: string;
  canWrite: boolean;
}
