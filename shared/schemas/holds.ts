/** Legal holds on an order, a heat or an item: they block disposal until a signed release. */
import { z } from 'zod';
import { filterParam } from './intake-common';

/** What a hold can name. */
export const HOLD_SCOPES = ['order', 'heat', 'item'] as const;

/** A hold's scope. */
export type HoldScope = (typeof HOLD_SCOPES)[number];

/** POST /api/holds. For a heat, `ref` is its heat number; `heatId` settles a number two producers share. */
export const HoldCreateSchema = z.strictObject({
  scope: z.enum(HOLD_SCOPES, { error: 'A hold is on an order, a heat or an item.' }),
  ref: z.string({ error: 'Name the order number, heat number or item code to hold.' }).trim().min(1, 'Name the order number, heat number or item code to hold.').max(120),
  heatId: z.number().int().positive().optional(),
  reason: z.string({ error: 'Give the reason for the hold.' }).trim().min(1, 'Give the reason for the hold.').max(500, 'Keep the reason under 500 characters.'),
});

/** A validated hold. */
export type HoldCreate = z.infer<typeof HoldCreateSchema>;

/** POST /api/holds/:id/release: a signature with the meaning "hold-release", and why. */
export const HoldReleaseSchema = z.strictObject({
  signatureToken: z.string().trim().min(1).optional(),
  reason: z.string({ error: 'Say why the hold can end.' }).trim().min(1, 'Say why the hold can end.').max(500),
});

/** A validated release. */
export type HoldRelease = z.infer<typeof HoldReleaseSchema>;

/** GET /api/holds. */
export const HoldListQuerySchema = z.object({
  active: filterParam(z.enum(['true', 'false'])),
  scope: filterParam(z.enum(HOLD_SCOPES)),
});

/** A hold as the API shows it. */
export interface HoldView {
  id: number;
  scope: HoldScope;
  ref: string;
  reason: string;
  placedAt: string;
  placedBy: { id: number; name: string };
  releasedAt: string | null;
  releasedBy: { id: number; name: string } | null;
  releaseReason: string | null;
  /** How many retained items it covers now. */
  items: number;
}
