import type { SampleView } from '../../shared/schemas/samples';
import { isoTime } from './page';

/** A sample row as the list and detail queries select it. */
export interface SampleRow {
  id: number;
  code: string;
  order_id: number;
  order_number: string;
  heat_id: number;
  heat_number: string;
  position: string;
  orientation: string;
  thickness_mm: string | null;
  specimen_count: number;
  created_at: Date;
}

/** A sample as the API shows it. */
export function presentSample(row: SampleRow): SampleView {
  return {
    id: row.id,
    code: row.code,
    orderId: row.order_id,
    orderNumber: row.order_number,
    heatId: row.heat_id,
    heatNumber: row.heat_number,
    position: row.position,
    orientation: row.orientation,
    thicknessMm: row.thickness_mm,
    specimenCount: Number(row.specimen_count),
    createdAt: isoTime(row.created_at),
  };
}
