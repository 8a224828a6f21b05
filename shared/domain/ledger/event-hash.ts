import { z } from 'zod';
import { canonicalBytes, canonicalJson } from './canonical';
import { sha256Hex } from './sha256';

/** The prevHash of the first event of every item: 64 zeros. */
export const GENESIS_HASH = '0'.repeat(64);

/** Version of the hashed event body described in docs/ledger-format.md. */
export const EVENT_FORMAT_VERSION = 1;

/** A ledger hash: lowercase hexadecimal SHA-256, 64 digits. */
export const HashHex = z.string().regex(/^[0-9a-f]{64}$/, 'must be 64 lowercase hexadecimal digits');

/**
 * A UTC instant written as ISO-8601 with milliseconds and a Z, e.g. 2026-12-01T10:00:00.000Z:
 * the form Date.prototype.toISOString() gives for years 0000–9999, so one instant has one spelling.
 */
export const IsoMillis = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}T\d{2}:\d{2}:\d{2}\.\d{3}Z$/, 'must look like 2026-12-01T10:00:00.000Z')
  .refine((text) => {
    const time = Date.parse(text);
    return Number.isFinite(time) && new Date(time).toISOString() === text;
  }, 'is not a real UTC instant');

/** A scanned code (item, station or container) as printed: visible ASCII, no spaces. */
export const CodeText = z.string().regex(/^[\x21-\x7e]{1,64}$/, 'must be 1–64 visible ASCII characters');

/** Event types are spelled in lower snake case; the state machine decides which ones exist. */
export const EventTypeText = z.string().regex(/^[a-z][a-z0-9_]{0,39}$/, 'must be lower snake case');

const Id = z.number().int().positive().max(Number.MAX_SAFE_INTEGER);

/** Who caused an event: a signed-in user or an instrument (by its database id). */
export const Actor = z.strictObject({ kind: z.enum(['user', 'instrument']), id: Id });

/** An electronic signature carried by an event (void, disposal, override). */
export const EventSignature = z.strictObject({
  signer: Id,
  meaning: z.string().min(1).max(200),
  signedAt: IsoMillis,
});

/** An event payload: a JSON object, {} when the event has none. */
export const EventPayload = z.record(z.string(), z.json());

/** The members of a custody event that its hash covers, format version 1, exactly these. */
export const HashedEventSchema = z.strictObject({
  v: z.literal(EVENT_FORMAT_VERSION),
  item: CodeText,
  seq: z.number().int().positive().max(Number.MAX_SAFE_INTEGER),
  type: EventTypeText,
  actor: Actor,
  station: CodeText.nullable(),
  container: CodeText.nullable(),
  occurredAt: IsoMillis,
  recordedAt: IsoMillis,
  payload: EventPayload,
  idempotencyKey: z.string().min(1).max(200),
  corrects: HashHex.nullable(),
  signature: EventSignature.nullable(),
  prevHash: HashHex,
});

/** The hashed body of a custody event. */
export type HashedEvent = z.infer<typeof HashedEventSchema>;

/** A custody event as stored: its hashed body and its hash. */
export type LedgerEvent = HashedEvent & { hash: string };

/** The last event of one item's chain. */
export type ChainHead = { item: string; seq: number; hash: string };

/** Raised when an event body does not fit format version 1; `issues` says which members and why. */
export class EventFormatError extends Error {
  readonly issues: string[];

  constructor(issues: string[]) {
    super(`Event does not fit ledger format v1: ${issues.join('; ')}`);
    this.name = 'EventFormatError';
    this.issues = issues;
  }
}

/** The fourteen members an event hash covers. */
export const HASHED_EVENT_MEMBERS = Object.keys(HashedEventSchema.shape) as readonly (keyof HashedEvent)[];

/**
 * Picks exactly the hashed members from an event (extra members such as `hash` or a database id
 * are left out) and checks them against format v1. Throws EventFormatError when one is missing
 * or malformed: a missing member must never be dropped silently from the hash.
 */
export function eventHashBody(event: HashedEvent): HashedEvent {
  const source = event as unknown as Record<string, unknown>;
  const picked: Record<string, unknown> = {};
  for (const member of HASHED_EVENT_MEMBERS) picked[member] = source[member];
  const parsed = HashedEventSchema.safeParse(picked);
  if (!parsed.success) {
    throw new EventFormatError(
      parsed.error.issues.map((issue) => `${issue.path.length > 0 ? issue.path.join('.') : 'event'}: ${issue.message}`),
    );
  }
  const protoPath = findProtoKey(picked.payload, 'payload');
  if (protoPath !== null) throw new EventFormatError([`${protoPath}: the member name __proto__ is not allowed`]);
  // Canonicalise once here so a payload that zod accepted but RFC 8785 refuses fails now.
  canonicalJson(picked);
  // Return the caller's values, not zod's copy: copying can lose members, and the hash must
  // cover exactly what was given.
  return picked as HashedEvent;
}

/**
 * Finds a member named __proto__: plain assignment (Object.assign, many parsers and copies)
 * turns it into a prototype instead of a member, so such a payload would hash differently
 * after a round trip through ordinary code.
 */
function findProtoKey(value: unknown, path: string): string | null {
  if (typeof value !== 'object' || value === null) return null;
  if (Array.isArray(value)) {
    for (let i = 0; i < value.length; i++) {
      const found = findProtoKey(value[i], `${path}[${i}]`);
      if (found !== null) return found;
    }
    return null;
  }
  for (const [key, member] of Object.entries(value)) {
    if (key === '__proto__') return `${path}.__proto__`;
    const found = findProtoKey(member, `${path}.${key}`);
    if (found !== null) return found;
  }
  return null;
}

/** The canonical JSON (RFC 8785) of an event's hashed body: the text its hash is taken over. */
export function eventHashInput(event: HashedEvent): string {
  return canonicalJson(eventHashBody(event));
}

/** An event's hash: lowercase hex SHA-256 of the UTF-8 bytes of eventHashInput(event). */
export function computeEventHash(event: HashedEvent): string {
  return sha256Hex(canonicalBytes(eventHashBody(event)));
}

/** Why a chain check stopped. */
export type ChainBreakReason =
  | 'invalid-event'
  | 'seq-gap'
  | 'seq-repeat'
  | 'prev-hash-mismatch'
  | 'hash-mismatch'
  | 'void-target-unknown';

/** The first broken link found by verifyChain. */
export type ChainBreak = {
  /** Position of the event in the list given to verifyChain (0-based). */
  eventIndex: number;
  item: string;
  seq: number | null;
  reason: ChainBreakReason;
  expected: string | number | null;
  actual: string | number | null;
  message: string;
};

/** Result of verifyChain. */
export type ChainVerification =
  | { ok: true; eventsChecked: number; heads: ChainHead[] }
  | { ok: false; eventsChecked: number; firstBreak: ChainBreak };

function fieldOf(event: unknown, member: string): unknown {
  return typeof event === 'object' && event !== null ? (event as Record<string, unknown>)[member] : undefined;
}

/**
 * Recomputes every event's hash and checks each item's chain: seq runs 1, 2, 3… with no gap or
 * repeat, prevHash is the previous event's hash of the same item (GENESIS_HASH for seq 1), the
 * stored hash equals the recomputed one, and `corrects` names an earlier event of the same item.
 * Events of different items may be interleaved; each item's events must come in seq order.
 * Stops at, and names, the first break. heads are sorted by item code (UTF-16 code units).
 */
export function verifyChain(events: readonly LedgerEvent[]): ChainVerification {
  const chains = new Map<string, { seq: number; hash: string; hashes: Set<string> }>();
  for (let index = 0; index < events.length; index++) {
    const event = events[index];
    const itemField = fieldOf(event, 'item');
    const seqField = fieldOf(event, 'seq');
    const item = typeof itemField === 'string' ? itemField : String(itemField);
    const seqOrNull = typeof seqField === 'number' ? seqField : null;
    const broken = (
      reason: ChainBreakReason,
      expected: string | number | null,
      actual: string | number | null,
      message: string,
    ): ChainVerification => ({
      ok: false,
      eventsChecked: index,
      firstBreak: { eventIndex: index, item, seq: seqOrNull, reason, expected, actual, message },
    });

    let body: HashedEvent;
    try {
      body = eventHashBody(event);
      HashHex.parse(event.hash);
    } catch (error) {
      const problem =
        error instanceof EventFormatError
          ? error.issues.join('; ')
          : error instanceof z.ZodError
            ? 'hash: must be 64 lowercase hexadecimal digits'
            : error instanceof Error
              ? error.message
              : String(error);
      return broken('invalid-event', null, problem, `Event ${index} (${item}) is not a valid v1 event: ${problem}`);
    }

    const chain = chains.get(body.item) ?? { seq: 0, hash: GENESIS_HASH, hashes: new Set<string>() };
    const expectedSeq = chain.seq + 1;
    if (body.seq > expectedSeq) {
      return broken('seq-gap', expectedSeq, body.seq, `${body.item}: expected seq ${expectedSeq}, found ${body.seq}`);
    }
    if (body.seq < expectedSeq) {
      return broken('seq-repeat', expectedSeq, body.seq, `${body.item}: seq ${body.seq} comes again after ${chain.seq}`);
    }
    if (body.prevHash !== chain.hash) {
      return broken(
        'prev-hash-mismatch',
        chain.hash,
        body.prevHash,
        `${body.item} seq ${body.seq}: prevHash does not match the hash of seq ${chain.seq}`,
      );
    }
    const recomputed = computeEventHash(body);
    if (recomputed !== event.hash) {
      return broken(
        'hash-mismatch',
        recomputed,
        event.hash,
        `${body.item} seq ${body.seq}: the stored hash is not the hash of the event's contents`,
      );
    }
    if (body.corrects !== null && !chain.hashes.has(body.corrects)) {
      return broken(
        'void-target-unknown',
        null,
        body.corrects,
        `${body.item} seq ${body.seq}: corrects names no earlier event of this item`,
      );
    }
    chain.seq = body.seq;
    chain.hash = recomputed;
    chain.hashes.add(recomputed);
    chains.set(body.item, chain);
  }
  const heads = [...chains.entries()]
    .map(([item, chain]) => ({ item, seq: chain.seq, hash: chain.hash }))
    .sort((a, b) => compareCodeUnits(a.item, b.item));
  return { ok: true, eventsChecked: events.length, heads };
}

/** Orders strings by UTF-16 code units, the order RFC 8785 uses for keys (Array.prototype.sort's default). */
export function compareCodeUnits(a: string, b: string): number {
  return a < b ? -1 : a > b ? 1 : 0;
}
