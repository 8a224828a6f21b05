/**
 * Retention: the lab's settings, the rules on customers and orders, the due list and the digest.
 * The dates themselves are worked out by shared/domain/retention.ts.
 */
import { z } from 'zod';
import { RETENTION_BASES, type DisposalCheck, type RetentionRule, type RetentionSource } from '../domain/retention';
import { filterParam, listQuerySchema, type Page } from './intake-common';

const period = (max: number, what: string) =>
  z
    .number({ error: `${what} is a whole number from 0 to ${max}.` })
    .int(`${what} is a whole number from 0 to ${max}.`)
    .min(0, `${what} is a whole number from 0 to ${max}.`)
    .max(max, `${what} is a whole number from 0 to ${max}.`)
    .nullish();

/** A rule as forms send it: any of days, months, years (null or absent for none) and the basis. */
export const RuleBodySchema = z
  .strictObject({
    days: period(36_500, 'Days'),
    months: period(1_200, 'Months'),
    years: period(100, 'Years'),
    basis: z.enum(RETENTION_BASES, { error: 'Retention counts from the report or from the test.' }),
  })
  .refine((r) => r.days != null || r.months != null || r.years != null, {
    message: 'Give days, months or years.',
    path: ['days'],
  });

/** A validated rule body. */
export type RuleBody = z.infer<typeof RuleBodySchema>;

/** PUT /api/retention/customers/:id and /orders/:id: the rule, or null to fall back to the next one. */
export const RuleUpdateSchema = z.strictObject({ rule: RuleBodySchema.nullable() });

/** A validated rule update. */
export type RuleUpdate = z.infer<typeof RuleUpdateSchema>;

function knownTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat('en-US', { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}

/** PUT /api/retention/settings. */
export const SettingsUpdateSchema = z.strictObject({
  timeZone: z
    .string()
    .trim()
    .min(1, 'Give the lab’s time zone, such as Europe/London.')
    .refine(knownTimeZone, 'Not a time zone this server knows; use an IANA name such as Europe/London.'),
  defaultRule: RuleBodySchema,
  endOfMonth: z.enum(['clamp', 'overflow'], { error: 'End of month is clamp or overflow.' }),
  digestDays: z.number().int().min(1, 'The digest looks 1 to 365 days ahead.').max(365, 'The digest looks 1 to 365 days ahead.'),
  digestHour: z.number().int().min(0, 'The digest hour is 0 to 23.').max(23, 'The digest hour is 0 to 23.'),
});

/** A validated settings update. */
export type SettingsUpdate = z.infer<typeof SettingsUpdateSchema>;

/** GET /api/retention/settings. */
export interface RetentionSettingsView {
  timeZone: string;
  defaultRule: RetentionRule;
  endOfMonth: 'clamp' | 'overflow';
  digestDays: number;
  digestHour: number;
  updatedAt: string;
}

/** The verdicts the due list can filter by. */
export const DUE_STATUSES = ['may_go', 'not_due', 'held'] as const;

/** The due list's sort keys. */
export const DUE_SORT_KEYS = ['notBefore', 'code', 'order', 'heat', 'customer', 'location', 'status'] as const;

/** GET /api/retention/due: search, sort, page, and filters. */
export const DueQuerySchema = listQuerySchema(DUE_SORT_KEYS, 'notBefore').extend({
  status: filterParam(z.enum(DUE_STATUSES, { error: `Status is one of: ${DUE_STATUSES.join(', ')}.` })),
  /** Only items whose date is within this many days from now (already due included). */
  within: filterParam(z.coerce.number().int().min(0, 'Within is 0 to 3650 days.').max(3650, 'Within is 0 to 3650 days.')),
  order: filterParam(z.string().trim().max(64)),
  customerId: filterParam(z.coerce.number().int().positive()),
});

/** A validated due-list query. */
export type DueQuery = z.infer<typeof DueQuerySchema>;

/** One retained item on the due list, with its verdict now. */
export interface DueItemView {
  code: string;
  kind: 'specimen' | 'half';
  state: string;
  specimen: string | null;
  order: string;
  orderId: number;
  customer: string;
  customerId: number;
  heat: string;
  location: string;
  status: DisposalCheck['status'];
  message: string;
  /** The first instant it may go (UTC), and that day in the lab's zone; null when not known yet. */
  notBefore: string | null;
  firstDay: string | null;
  rule: RetentionRule | null;
  source: RetentionSource | null;
  holds: { id: number; scope: string; ref: string; reason: string }[];
}

/** The answer of GET /api/retention/due. */
export interface DueListView extends Page<DueItemView> {
  timeZone: string;
  now: string;
  counts: Record<DisposalCheck['status'], number>;
}

/** POST /api/retention/digest: send the digest now (counted as today's run unless one was sent). */
export const DigestRunSchema = z.strictObject({
  days: z.number().int().min(1).max(365).optional(),
});

/** What a digest run did. */
export interface DigestResult {
  /** `sent`; `skipped` when another server (or an earlier run) already claimed this run; `empty` when nothing falls due. */
  outcome: 'sent' | 'skipped' | 'empty';
  runKey: string;
  recipients: string[];
  dueSoon: number;
  dueNow: number;
}

/** POST /api/store/put-away: put scanned halves, specimens, bags or boxes into one storage container. */
export const PutAwaySchema = z.strictObject({
  into: z.string({ error: 'Scan the bag, box or shelf to put things into.' }).trim().min(1, 'Scan the bag, box or shelf to put things into.'),
  codes: z.array(z.string()).min(1, 'Scan at least one item.').max(500, 'Put away at most 500 items at once.'),
  stationCode: z.string().trim().min(1).max(64).optional(),
});

/** A validated put-away. */
export type PutAway = z.infer<typeof PutAwaySchema>;

/** One code's outcome of a put-away. */
export interface PutAwayOutcome {
  code: string;
  ok: boolean;
  /** The event recorded (`retained` from a bin, `moved` from storage). */
  type: 'retained' | 'moved' | null;
  message: string;
}

/** A retained piece in the store tree. */
export interface StoreItem {
  code: string;
  kind: 'specimen' | 'half';
  state: string;
  order: string | null;
  heat: string | null;
  status: string | null;
  firstDay: string | null;
}

/** A container in the store tree, with what it holds. */
export interface StoreNode {
  code: string;
  name: string;
  containerType: string;
  state: string;
  items: StoreItem[];
  children: StoreNode[];
  /** Pieces in it and in everything inside it. */
  total: number;
}

/** GET /api/store/tree: shelves (and loose boxes and bags) with their contents, and the bins waiting to be emptied. */
export interface StoreTreeView {
  roots: StoreNode[];
  bins: StoreNode[];
  timeZone: string;
}
