import type { OrderStatus, OrderView } from '../../shared/schemas/orders';
import { isoTime } from './page';

/** An order row as the list and detail queries select it. */
export interface OrderRow {
  id: number;
  number: string;
  customer_id: number;
  customer_name: string;
  po_reference: string;
  material_spec: string;
  tests_requested: string[];
  specimens_per_heat: number;
  geometry_key: string;
  test_standard: string;
  area_policy: string;
  retention_days: number | null;
  retention_basis: string;
  due_date: string | null;
  status: OrderStatus;
  heat_count: number;
  specimen_count: number;
  created_at: Date;
}

/** An order as the API shows it. */
export function presentOrder(row: OrderRow): OrderView {
  return {
    id: row.id,
    number: row.number,
    customerId: row.customer_id,
    customerName: row.customer_name,
    poReference: row.po_reference,
    materialSpec: row.material_spec,
    testsRequested: row.tests_requested,
    specimensPerHeat: row.specimens_per_heat,
    geometryKey: row.geometry_key,
    testStandard: row.test_standard,
    areaPolicy: row.area_policy,
    retentionDays: row.retention_days,
    retentionBasis: row.retention_basis,
    dueDate: row.due_date,
    status: row.status,
    heatCount: Number(row.heat_count),
    specimenCount: Number(row.specimen_count),
    createdAt: isoTime(row.created_at),
  };
}
