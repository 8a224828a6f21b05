/** Custody events as clients post them: one scan, or a batch of scans (offline sync, cells). */
import { z } from 'zod';
import { EVENT_TYPES, type EventType, type ItemKind, type ProjectionState } from '../domain/ledger/state-machine';
import { HashHex, type LedgerEvent } from '../domain/ledger/event-hash';

/** Most events one POST /api/events/batch may carry. */
export const MAX_BATCH_EVENTS = 500;

/** Largest payload, as JSON text, one event may carry (readings, results, reasons, hashes). */
export const MAX_PAYLOAD_CHARS = 32_000;

const codeText = (what: string) =>
  z
    .string({ error: `Scan or type the ${what} code.` })
    .trim()
    .min(1, { error: `Scan or type the ${what} code.` })
    .max(64, { error: `A ${what} code is at most 64 characters.` });

/** Finds a NUL character: PostgreSQL's jsonb cannot store one, so it is refused up front. */
function hasNul(value: unknown): boolean {
  if (typeof value === 'string') return value.includes('\u0000');
  if (Array.isArray(value)) return value.some(hasNul);
  if (typeof value === 'object' && value !== null) {
    return Object.entries(value).some(([key, member]) => key.includes('\u0000') || hasNul(member));
  }
  return false;
}

/** An instant with an offset or Z, normalised to UTC with milliseconds (the ledger's spelling). */
export const OccurredAtSchema = z
  .string({ error: "Send the device's time as an ISO-8601 instant, such as 2026-12-01T10:00:00.000Z." })
  .refine((text) => /^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}(:\d{2}(\.\d{1,9})?)?(Z|[+-]\d{2}:?\d{2})$/.test(text), {
    error: "Send the device's time as an ISO-8601 instant with a Z or an offset, such as 2026-12-01T10:00:00.000Z.",
  })
  .transform((text, ctx) => {
    const time = Date.parse(text);
    const year = Number.isFinite(time) ? new Date(time).getUTCFullYear() : NaN;
    if (!Number.isFinite(time) || year < 1 || year > 9999) {
      ctx.addIssue({ code: 'custom', message: 'This is not a real instant.' });
      return z.NEVER;
    }
    return new Date(time).toISOString();
  });

/** An event payload: a JSON object (readings, results, reason, attachment hashes). */
export const EventPayloadInputSchema = z
  .record(z.string(), z.json())
  .refine((payload) => !hasNul(payload), { error: 'The payload may not hold NUL characters (\\u0000).' })
  .refine((payload) => JSON.stringify(payload).length <= MAX_PAYLOAD_CHARS, {
    error: `The payload is too large: at most ${MAX_PAYLOAD_CHARS} characters of JSON.`,
  });

/** One custody event as a client posts it (POST /api/events, and each element of a batch). */
export const EventInputSchema = z.strictObject({
  /** The client's key for this scan; sending it again never records a second event. */
  idempotencyKey: z
    .string({ error: 'Send an idempotency key (a UUID made on the device) with every event.' })
    .trim()
    .min(1, { error: 'Send an idempotency key (a UUID made on the device) with every event.' })
    .max(200, { error: 'An idempotency key is at most 200 characters.' }),
  type: z.enum(EVENT_TYPES, { error: `Choose an event type: ${EVENT_TYPES.join(', ')}.` }),
  itemCode: codeText('item'),
  stationCode: codeText('station').optional(),
  containerCode: codeText('container').nullish(),
  occurredAt: OccurredAtSchema,
  payload: EventPayloadInputSchema.default({}),
  /** For a void: the hash of the event to cancel; the most recent event in force when left out. */
  corrects: HashHex.optional(),
  /** For a void: the token from POST /api/auth/signature. */
  signatureToken: z.string().min(1).max(2000).optional(),
});

/** One event as posted. */
export type EventInput = z.input<typeof EventInputSchema>;

/** One event after validation. */
export type ParsedEventInput = z.output<typeof EventInputSchema>;

/** POST /api/events/batch. Each element is validated on its own, so one bad event fails alone. */
export const EventBatchSchema = z.strictObject({
  events: z
    .array(z.unknown(), { error: 'Send the events as a list.' })
    .min(1, { error: 'Send at least one event.' })
    .max(MAX_BATCH_EVENTS, { error: `Send at most ${MAX_BATCH_EVENTS} events per batch; split the rest.` }),
});

/** GET /api/items/:code/events paging. */
export const ItemEventsQuerySchema = z.object({
  after: z.coerce.number().int().min(0).default(0),
  limit: z.coerce.number().int().min(1).max(1000).default(500),
});

/** A stored custody event as the API shows it: the hashed body, its hash and its row id. */
export type EventView = LedgerEvent & { id: number };

/** An item's state after an event, with what may follow. */
export interface ItemSummary {
  code: string;
  kind: ItemKind;
  state: ProjectionState;
  allowed: EventType[];
  container: string | null;
  station: string | null;
}

/** An event recorded now (201) or found under its idempotency key (200): POST /api/events answers this. */
export interface RecordedEvent {
  status: 200 | 201;
  replayed: boolean;
  event: EventView;
  item: ItemSummary;
  /** Codes of half A and half B when this event is a fractured `tested`. */
  halves: string[];
  /** Out-of-tolerance readings and other things a person should look at; empty when none. */
  flags: string[];
}

/** Why an event was refused, in the API's error shape. */
export interface EventError {
  code: string;
  message: string;
  details?: unknown;
}
