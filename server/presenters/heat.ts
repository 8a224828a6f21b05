import type { HeatView } from '../../shared/schemas/heats';
import { isoTime } from './page';

/** A heat row as the list and detail queries select it. */
export interface HeatRow {
  id: number;
  heat_number: string;
  material: string;
  grade: string;
  producer: string;
  certificate_ref: string | null;
  order_count: number;
  specimen_count: number;
  created_at: Date;
}

/** A heat as the API shows it. */
export function presentHeat(row: HeatRow): HeatView {
  return {
    id: row.id,
    heatNumber: row.heat_number,
    material: row.material,
    grade: row.grade,
    producer: row.producer,
    certificateRef: row.certificate_ref,
    orderCount: Number(row.order_count),
    specimenCount: Number(row.specimen_count),
    createdAt: isoTime(row.created_at),
  };
}
