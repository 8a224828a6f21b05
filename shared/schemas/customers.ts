/** Customers: who orders the tests. Request bodies, list query and the shape the API answers. */
import { z } from 'zod';
import { listQuerySchema, optionalText, optionalWholeNumber, requiredText } from './intake-common';

const RETENTION = 'Retention is a whole number of days from 0 to 36500, or empty for the lab default.';

/** POST /api/customers */
export const CustomerCreateSchema = z.object({
  name: requiredText(200, 'Enter the customer’s name.'),
  contactEmail: optionalText(320)
    .refine((v) => v == null || z.email().safeParse(v).success, {
      message: 'Enter a valid e-mail address, like quality@customer.example, or leave it empty.',
    })
    .transform((v) => (typeof v === 'string' ? v.toLowerCase() : v)),
  retentionDays: optionalWholeNumber(0, 36500, RETENTION),
});
export type CustomerCreate = z.infer<typeof CustomerCreateSchema>;

/** PATCH /api/customers/:id: any of the fields above. */
export const CustomerUpdateSchema = CustomerCreateSchema.partial();
export type CustomerUpdate = z.infer<typeof CustomerUpdateSchema>;

export const CUSTOMER_SORTS = ['name', 'createdAt', 'orders'] as const;

/** GET /api/customers */
export const CustomerListQuerySchema = listQuerySchema(CUSTOMER_SORTS, 'name');
export type CustomerListQuery = z.infer<typeof CustomerListQuerySchema>;

/** A customer as the API shows it. */
export interface CustomerView {
  id: number;
  name: string;
  contactEmail: string | null;
  retentionDays: number | null;
  orderCount: number;
  createdAt: string;
}
