/** Orders: what a customer asked the lab to test. Request bodies, list query and API shape. */
import { z } from 'zod';
import { AreaPolicySchema } from '../domain/measurement';
import { GeometryKeySchema } from '../domain/specimen-geometries';
import { HeatCreateSchema, type HeatView } from './heats';
import {
  filterParam,
  idField,
  listQuerySchema,
  OptionalDateSchema,
  optionalWholeNumber,
  requiredText,
  wholeNumber,
} from './intake-common';

/** Where an order stands. */
export const ORDER_STATUSES = ['open', 'in_test', 'reported', 'closed'] as const;
export type OrderStatus = (typeof ORDER_STATUSES)[number];
export const ORDER_STATUS_LABELS: Record<OrderStatus, string> = {
  open: 'Open',
  in_test: 'In test',
  reported: 'Reported',
  closed: 'Closed',
};

/** Tests a customer may ask for. */
export const TESTS = ['tensile', 'bend', 'hardness', 'impact'] as const;
export const TEST_LABELS: Record<(typeof TESTS)[number], string> = {
  tensile: 'Tensile',
  bend: 'Bend',
  hardness: 'Hardness',
  impact: 'Impact',
};

/** Whether retention runs from the report date or from the test date. */
export const RETENTION_BASES = ['report', 'test'] as const;

export const OrderStatusSchema = z.enum(ORDER_STATUSES, { error: `Status is one of: ${ORDER_STATUSES.join(', ')}.` });

const orderFields = {
  number: requiredText(40, 'Enter the lab’s order number.').regex(/^[A-Za-z0-9][A-Za-z0-9._/-]*$/, {
    message: 'An order number holds letters, digits, and . _ / - (no spaces).',
  }),
  customerId: idField('Choose the customer.'),
  poReference: requiredText(100, 'Enter the customer’s purchase-order reference.'),
  materialSpec: requiredText(200, 'Enter the material specification, e.g. ASTM A36.'),
  testsRequested: z
    .array(z.enum(TESTS, { error: `Tests are chosen from: ${TESTS.join(', ')}.` }))
    .min(1, 'Choose at least one test.')
    .refine((list) => new Set(list).size === list.length, { message: 'Each test is listed once.' }),
  specimensPerHeat: wholeNumber(1, 50, 'Specimens per heat is a whole number from 1 to 50.'),
  geometryKey: GeometryKeySchema,
  testStandard: requiredText(100, 'Enter the test standard, e.g. ASTM E8/E8M.'),
  areaPolicy: AreaPolicySchema,
  retentionDays: optionalWholeNumber(0, 36500, 'Retention is a whole number of days from 0 to 36500, or empty for the customer’s rule.'),
  retentionBasis: z.enum(RETENTION_BASES, { error: 'Retention counts from the report or from the test.' }),
  dueDate: OptionalDateSchema,
};

/** POST /api/orders; `heatIds` puts existing heats on the new order at once. */
export const OrderCreateSchema = z.object({
  ...orderFields,
  testsRequested: orderFields.testsRequested.default(['tensile']),
  specimensPerHeat: orderFields.specimensPerHeat.default(2),
  areaPolicy: orderFields.areaPolicy.default('min-dimensions'),
  retentionBasis: orderFields.retentionBasis.default('report'),
  heatIds: z
    .array(idField('A heat id is a positive whole number.'))
    .refine((ids) => new Set(ids).size === ids.length, { message: 'A heat may be on an order only once; one is listed twice.' })
    .optional(),
});
export type OrderCreate = z.infer<typeof OrderCreateSchema>;

/** PATCH /api/orders/:id: what may change, including the status. */
export const OrderUpdateSchema = z.object({ ...orderFields, status: OrderStatusSchema }).partial();
export type OrderUpdate = z.infer<typeof OrderUpdateSchema>;

/** POST /api/orders/:id/heats: `heatId` of an existing heat, or `heat`, a new heat to register and add. */
export const OrderHeatAddSchema = z
  .object({
    heatId: idField('Choose a heat.').optional(),
    heat: HeatCreateSchema.optional(),
  })
  .refine((b) => (b.heatId === undefined) !== (b.heat === undefined), {
    message: 'Send either the id of an existing heat or the fields of a new one.',
    path: ['heatId'],
  });
export type OrderHeatAdd = z.infer<typeof OrderHeatAddSchema>;

export const ORDER_SORTS = ['number', 'dueDate', 'createdAt', 'customer', 'status'] as const;

/** GET /api/orders: search, sort, paging, and filters by customer, status and heat. */
export const OrderListQuerySchema = listQuerySchema(ORDER_SORTS, '-createdAt').extend({
  customerId: filterParam(idField('Filter by a customer id.')),
  heatId: filterParam(idField('Filter by a heat id.')),
  status: filterParam(OrderStatusSchema),
});
export type OrderListQuery = z.infer<typeof OrderListQuerySchema>;

/** An order as lists show it. */
export interface OrderView {
  id: number;
  number: string;
  customerId: number;
  customerName: string;
  poReference: string;
  materialSpec: string;
  testsRequested: string[];
  specimensPerHeat: number;
  geometryKey: string;
  testStandard: string;
  areaPolicy: string;
  retentionDays: number | null;
  retentionBasis: string;
  dueDate: string | null;
  status: OrderStatus;
  heatCount: number;
  specimenCount: number;
  createdAt: string;
}

/** GET /api/orders/:id: the order with its heats and samples. */
export interface OrderDetail extends OrderView {
  heats: (HeatView & { sampleCount: number })[];
  samples: { id: number; code: string; heatId: number; heatNumber: string; position: string; orientation: string; thicknessMm: string | null; specimenCount: number }[];
  canWrite: boolean;
}
