/** Disposal and return batches: scanned items, a signature, and the document that records them. */
import { z } from 'zod';
import { listQuerySchema, filterParam } from './intake-common';

/** The most items one batch may hold. */
export const MAX_BATCH_ITEMS = 500;

/** What a batch does: dispose of the items, or hand them back to the customer. */
export const BATCH_KINDS = ['disposal', 'return'] as const;

/** A batch's kind. */
export type BatchKind = (typeof BATCH_KINDS)[number];

const batchFields = {
  kind: z.enum(BATCH_KINDS, { error: 'A batch is a disposal or a return.' }).default('disposal'),
  codes: z
    .array(z.string({ error: 'Each code is text.' }), { error: 'Scan the items of the batch.' })
    .min(1, 'Scan at least one item.')
    .max(MAX_BATCH_ITEMS, `A batch holds at most ${MAX_BATCH_ITEMS} items.`),
  /** When given, every item must belong to this order. */
  orderNumber: z.string().trim().min(1).max(64).optional(),
};

/** POST /api/disposals/check: the verdict for each scanned code, without signing anything. */
export const BatchCheckSchema = z.strictObject(batchFields);

/** A validated check. */
export type BatchCheck = z.infer<typeof BatchCheckSchema>;

/** POST /api/disposals: the batch and its signature token (meaning "disposal" or "return"). */
export const BatchCreateSchema = z.strictObject({
  ...batchFields,
  signatureToken: z.string().trim().min(1).optional(),
  /** For a return: who receives the items for the customer. */
  recipient: z.string().trim().max(200).optional(),
  note: z.string().trim().max(1000).optional(),
  idempotencyKey: z.string().trim().min(1).max(200).optional(),
});

/** A validated batch. */
export type BatchCreate = z.infer<typeof BatchCreateSchema>;

/** Why one scanned code may not go in the batch, or that it may. */
export type LineStatus = 'may_go' | 'not_due' | 'held' | 'not_retained' | 'duplicate' | 'other_order' | 'other_customer' | 'unknown' | 'invalid';

/** One scanned code's verdict. */
export interface BatchLine {
  /** The code as scanned. */
  scanned: string;
  code: string | null;
  ok: boolean;
  status: LineStatus;
  message: string;
  kind?: 'specimen' | 'half';
  specimen?: string | null;
  order?: string;
  customer?: string;
  heat?: string;
  location?: string;
  firstDay?: string | null;
}

/** The answer of POST /api/disposals/check, and the details of a refused batch. */
export interface BatchCheckView {
  ok: boolean;
  kind: BatchKind;
  lines: BatchLine[];
}

/** A recorded batch. */
export interface BatchView {
  id: number;
  number: string;
  kind: BatchKind;
  order: string | null;
  customer: string | null;
  signer: { id: number; name: string; email: string };
  meaning: string;
  statement: string;
  signedAt: string;
  recordedAt: string;
  recipient: string | null;
  note: string | null;
  documentSha256: string;
  documentUrl: string;
  items: { code: string; kind: string; specimen: string | null; order: string; heat: string; eventHash: string }[];
}

/** A batch in a list: everything but the item lines, with their count. */
export type BatchSummary = Omit<BatchView, 'items'> & { itemCount: number };

/** GET /api/disposals. */
export const BatchListQuerySchema = listQuerySchema(['recordedAt', 'number'] as const, '-recordedAt').extend({
  kind: filterParam(z.enum(BATCH_KINDS)),
});
