import { z } from 'zod';
import { canonicalBytes } from './canonical';
import {
  CodeText,
  compareCodeUnits,
  GENESIS_HASH,
  HashHex,
  IsoMillis,
  type ChainHead,
  type LedgerEvent,
} from './event-hash';
import { sha256Hex } from './sha256';

/** Version of the seal body described in docs/ledger-format.md. */
export const SEAL_FORMAT_VERSION = 1;

/** A UTC calendar day, YYYY-MM-DD. */
export const DayText = z
  .string()
  .regex(/^\d{4}-\d{2}-\d{2}$/, 'must look like 2026-12-01')
  .refine((day) => {
    const time = Date.parse(`${day}T00:00:00.000Z`);
    return Number.isFinite(time) && new Date(time).toISOString().slice(0, 10) === day;
  }, 'is not a real calendar day');

/** One sealed chain head. */
export const SealHead = z.strictObject({
  item: CodeText,
  seq: z.number().int().positive().max(Number.MAX_SAFE_INTEGER),
  hash: HashHex,
});

/** The hashed body of a daily seal, format version 1, exactly these members. */
export const SealBodySchema = z.strictObject({
  v: z.literal(SEAL_FORMAT_VERSION),
  day: DayText,
  heads: z.array(SealHead),
  prevSeal: HashHex,
});

/** The hashed body of a daily seal. */
export type SealBody = z.infer<typeof SealBodySchema>;

/** A daily seal as stored: its body and its hash. */
export type Seal = SealBody & { hash: string };

/** The members of an event a seal needs. */
export type SealableEvent = Pick<LedgerEvent, 'item' | 'seq' | 'hash' | 'recordedAt'>;

function describeIssues(error: z.ZodError): string {
  return error.issues.map((issue) => `${issue.path.join('.')}: ${issue.message}`).join('; ');
}

/** The first instant after a UTC day: the next day at 00:00:00.000Z. Throws on an invalid day. */
export function dayEnd(day: string): string {
  const parsed = DayText.safeParse(day);
  if (!parsed.success) throw new RangeError(`Invalid seal day ${JSON.stringify(day)}: must be a real YYYY-MM-DD day`);
  return new Date(Date.parse(`${day}T00:00:00.000Z`) + 86_400_000).toISOString();
}

/** The UTC day after the given one. */
export function nextDay(day: string): string {
  return dayEnd(day).slice(0, 10);
}

function checkedRecordedAt(event: SealableEvent): string {
  const parsed = IsoMillis.safeParse(event.recordedAt);
  if (!parsed.success) {
    const written = JSON.stringify(event.recordedAt);
    throw new RangeError(`Event ${event.item} seq ${event.seq} has an invalid recordedAt ${written}`);
  }
  return parsed.data;
}

function headsOf(latest: Map<string, SealableEvent>): ChainHead[] {
  return [...latest.values()]
    .map((event) => ({ item: event.item, seq: event.seq, hash: event.hash }))
    .sort((a, b) => compareCodeUnits(a.item, b.item));
}

function keepLatest(latest: Map<string, SealableEvent>, event: SealableEvent): void {
  const current = latest.get(event.item);
  if (current === undefined || event.seq > current.seq) latest.set(event.item, event);
}

/**
 * The chain heads as they stood at the end of a UTC day: for every item with at least one event
 * recorded before the next day's 00:00:00.000Z, its highest-seq such event; sorted by item code
 * in UTF-16 code-unit order.
 */
export function sealHeads(day: string, events: readonly SealableEvent[]): ChainHead[] {
  const end = dayEnd(day);
  const latest = new Map<string, SealableEvent>();
  // ISO-8601 UTC strings of one fixed form compare correctly as text.
  for (const event of events) if (checkedRecordedAt(event) < end) keepLatest(latest, event);
  return headsOf(latest);
}

/** A seal's hash: lowercase hex SHA-256 of the UTF-8 bytes of its body's canonical JSON. */
export function computeSealHash(body: SealBody): string {
  const parsed = SealBodySchema.safeParse(body);
  if (!parsed.success) {
    throw new RangeError(`Seal body does not fit format v1: ${describeIssues(parsed.error)}`);
  }
  return sha256Hex(canonicalBytes({ v: body.v, day: body.day, heads: body.heads, prevSeal: body.prevSeal }));
}

/**
 * The seal of UTC day `day` (YYYY-MM-DD) over the given ledger events, chained to the previous
 * day's seal hash (GENESIS_HASH for the first seal).
 */
export function computeSeal(day: string, events: readonly SealableEvent[], prevSealHash: string): Seal {
  const body: SealBody = { v: SEAL_FORMAT_VERSION, day, heads: sealHeads(day, events), prevSeal: prevSealHash };
  return { ...body, hash: computeSealHash(body) };
}

/** Why a seal check stopped. */
export type SealBreakReason =
  | 'invalid-seal'
  | 'day-out-of-order'
  | 'day-gap'
  | 'seal-hash-mismatch'
  | 'prev-seal-mismatch'
  | 'heads-differ';

/** How one item's sealed head differs from the head recomputed from the ledger. */
export type HeadDifference = {
  item: string;
  /** missing: sealed, but the ledger has no event of the item by that day (a deleted chain);
   *  unsealed: in the ledger by that day, but not in the seal (a back-dated insert);
   *  changed: both, with another seq or hash (deleted or rewritten events). */
  change: 'missing' | 'unsealed' | 'changed';
  sealed: { seq: number; hash: string } | null;
  recomputed: { seq: number; hash: string } | null;
};

/** The first broken seal found by verifySeals. */
export type SealBreak = {
  /** Position of the seal in the list given to verifySeals (0-based). */
  sealIndex: number;
  day: string;
  reason: SealBreakReason;
  expected: string | null;
  actual: string | null;
  /** For heads-differ: every differing item, in code order. */
  items: HeadDifference[];
  message: string;
};

/** Result of verifySeals. */
export type SealVerification =
  | { ok: true; sealsChecked: number }
  | { ok: false; sealsChecked: number; firstBreak: SealBreak };

/** Options for verifySeals. */
export type VerifySealsOptions = {
  /** prevSeal expected in the first seal given; GENESIS_HASH unless verifying from mid-way. */
  firstPrevSeal?: string;
  /** Compare only these items' heads (an audit pack that holds some chains, not the whole ledger). */
  items?: readonly string[];
};

function headDifferences(
  sealed: readonly ChainHead[],
  recomputed: readonly ChainHead[],
  scope: ReadonlySet<string> | null,
): HeadDifference[] {
  const inScope = (item: string) => scope === null || scope.has(item);
  const sealedMap = new Map(sealed.filter((h) => inScope(h.item)).map((h) => [h.item, h]));
  const recomputedMap = new Map(recomputed.filter((h) => inScope(h.item)).map((h) => [h.item, h]));
  const items = [...new Set([...sealedMap.keys(), ...recomputedMap.keys()])].sort(compareCodeUnits);
  const differences: HeadDifference[] = [];
  for (const item of items) {
    const s = sealedMap.get(item);
    const r = recomputedMap.get(item);
    const pick = (head: ChainHead | undefined) => (head === undefined ? null : { seq: head.seq, hash: head.hash });
    if (s !== undefined && r === undefined) differences.push({ item, change: 'missing', sealed: pick(s), recomputed: null });
    else if (s === undefined && r !== undefined) {
      differences.push({ item, change: 'unsealed', sealed: null, recomputed: pick(r) });
    }
    else if (s !== undefined && r !== undefined && (s.seq !== r.seq || s.hash !== r.hash)) {
      differences.push({ item, change: 'changed', sealed: pick(s), recomputed: pick(r) });
    }
  }
  return differences;
}

/**
 * Checks a run of daily seals, oldest first, against the ledger events: each seal's stored hash
 * is the hash of its body, its prevSeal is the previous seal's hash, the days follow one another
 * with no gap, and its heads equal the heads recomputed from the events. Names the first seal that
 * fails and, when heads differ, every item that is missing, unsealed or changed. Run verifyChain
 * first: an event with a malformed recordedAt makes this throw a RangeError.
 */
export function verifySeals(
  seals: readonly Seal[],
  events: readonly SealableEvent[],
  options: VerifySealsOptions = {},
): SealVerification {
  const scope = options.items === undefined ? null : new Set(options.items);
  const ordered = events
    .map((event) => ({ event, at: checkedRecordedAt(event) }))
    .sort((a, b) => compareCodeUnits(a.at, b.at));
  const latest = new Map<string, SealableEvent>();
  let cursor = 0;
  let prevHash = options.firstPrevSeal ?? GENESIS_HASH;
  let prevDay: string | null = null;

  for (let index = 0; index < seals.length; index++) {
    const seal = seals[index];
    const day = typeof seal?.day === 'string' ? seal.day : String(seal?.day);
    const broken = (
      reason: SealBreakReason,
      expected: string | null,
      actual: string | null,
      message: string,
      items: HeadDifference[] = [],
    ): SealVerification => ({
      ok: false,
      sealsChecked: index,
      firstBreak: { sealIndex: index, day, reason, expected, actual, items, message },
    });

    const body = SealBodySchema.safeParse({ v: seal.v, day: seal.day, heads: seal.heads, prevSeal: seal.prevSeal });
    if (!body.success || !HashHex.safeParse(seal.hash).success) {
      const problem = body.success ? 'hash: must be 64 lowercase hexadecimal digits' : describeIssues(body.error);
      return broken('invalid-seal', null, problem, `Seal ${index} (${day}) is not a valid v1 seal: ${problem}`);
    }
    if (prevDay !== null) {
      const expectedDay = nextDay(prevDay);
      if (day <= prevDay) {
        return broken('day-out-of-order', expectedDay, day, `Seal for ${day} comes after the seal for ${prevDay}`);
      }
      if (day !== expectedDay) {
        return broken('day-gap', expectedDay, day, `No seal for ${expectedDay}: the next seal is for ${day}`);
      }
    }
    const recomputedHash = computeSealHash(body.data);
    if (recomputedHash !== seal.hash) {
      const message = `Seal for ${day}: the stored hash is not the hash of its contents`;
      return broken('seal-hash-mismatch', recomputedHash, seal.hash, message);
    }
    if (seal.prevSeal !== prevHash) {
      const message = `Seal for ${day}: prevSeal is not the previous seal's hash`;
      return broken('prev-seal-mismatch', prevHash, seal.prevSeal, message);
    }

    const end = dayEnd(day);
    while (cursor < ordered.length && ordered[cursor].at < end) keepLatest(latest, ordered[cursor++].event);
    const recomputed = headsOf(latest);
    const differences = headDifferences(seal.heads, recomputed, scope);
    if (differences.length > 0) {
      const named = differences.map((d) => `${d.item} ${d.change}`).join(', ');
      return broken('heads-differ', null, null, `Seal for ${day} does not match the ledger: ${named}`, differences);
    }
    if (scope === null) {
      // Same heads as a set; the sealed list must also be in code order with no repeats.
      const inOrder = seal.heads.every((head, i) => i === 0 || compareCodeUnits(seal.heads[i - 1].item, head.item) < 0);
      if (!inOrder || seal.heads.length !== recomputed.length) {
        return broken('heads-differ', null, null, `Seal for ${day}: heads are not listed once each in code order`);
      }
    }
    prevHash = seal.hash;
    prevDay = day;
  }
  return { ok: true, sealsChecked: seals.length };
}
