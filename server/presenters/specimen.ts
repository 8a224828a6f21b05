import type { SpecimenView } from '../../shared/schemas/specimens';
import { isoTime } from './page';

/** A specimen row as the list and detail queries select it (items joined with specimens). */
export interface SpecimenRow {
  id: string | number;
  code: string;
  state: string;
  shape: 'flat' | 'round';
  geometry_key: string;
  test_standard: string;
  sample_id: number;
  sample_code: string;
  heat_id: number;
  heat_number: string;
  order_id: number;
  order_number: string;
  created_at: Date;
}

/** A specimen as the API shows it. */
export function presentSpecimen(row: SpecimenRow): SpecimenView {
  return {
    // items.id is a bigint, which pg returns as text; ids stay far below 2^53.
    id: Number(row.id),
    code: row.code,
    state: row.state,
    shape: row.shape,
    geometryKey: row.geometry_key,
    testStandard: row.test_standard,
    sampleId: row.sample_id,
    sampleCode: row.sample_code,
    heatId: row.heat_id,
    heatNumber: row.heat_number,
    orderId: row.order_id,
    orderNumber: row.order_number,
    createdAt: isoTime(row.created_at),
  };
}
