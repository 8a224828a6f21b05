import type { CustomerView } from '../../shared/schemas/customers';
import { isoTime } from './page';

/** A customer row as the list and detail queries select it. */
export interface CustomerRow {
  id: number;
  name: string;
  contact_email: string | null;
  retention_days: number | null;
  order_count: number;
  created_at: Date;
}

/** A customer as the API shows it. */
export function presentCustomer(row: CustomerRow): CustomerView {
  return {
    id: row.id,
    name: row.name,
    contactEmail: row.contact_email,
    retentionDays: row.retention_days,
    orderCount: Number(row.order_count),
    createdAt: isoTime(row.created_at),
  };
}
