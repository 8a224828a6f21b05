import { z } from 'zod';
import { canonicalJson } from './canonical';
import {
  CodeText,
  HASHED_EVENT_MEMBERS,
  HashHex,
  IsoMillis,
  verifyChain,
  type ChainBreakReason,
  type HashedEvent,
  type LedgerEvent,
} from './event-hash';
import { verifySeals, type HeadDifference, type Seal, type SealBody, type SealBreakReason } from './seal';

/** The name and version written in the header line of an audit export. */
export const AUDIT_FORMAT = 'halfmark-ledger-audit';
export const AUDIT_FORMAT_VERSION = 1;

/** The first line of an audit export. */
export const AuditHeader = z.strictObject({
  record: z.literal('header'),
  format: z.literal(AUDIT_FORMAT),
  v: z.literal(AUDIT_FORMAT_VERSION),
  exportedAt: IsoMillis,
  /** The items whose chains the export holds in full; null for the whole ledger. */
  items: z.array(CodeText).nullable(),
  /** prevSeal of the first seal line: the hash of the seal before the export's first day. */
  firstPrevSeal: HashHex,
});

/** The header of an audit export. */
export type AuditHeader = z.infer<typeof AuditHeader>;

const EVENT_MEMBERS: readonly string[] = HASHED_EVENT_MEMBERS;
const SEAL_MEMBERS: readonly string[] = ['v', 'day', 'heads', 'prevSeal'];

const EventLine = z.strictObject({ record: z.literal('event'), body: z.record(z.string(), z.unknown()), hash: z.string() });
const SealLine = z.strictObject({ record: z.literal('seal'), body: z.record(z.string(), z.unknown()), hash: z.string() });

/** The header line of an audit export, as canonical JSON. */
export function auditHeaderLine(header: Omit<AuditHeader, 'record' | 'format' | 'v'>): string {
  return canonicalJson({ record: 'header', format: AUDIT_FORMAT, v: AUDIT_FORMAT_VERSION, ...header });
}

/** One event as an audit line: `{"body":{…hashed members…},"hash":"…","record":"event"}`, canonical JSON. */
export function auditEventLine(event: LedgerEvent): string {
  const body: Record<string, unknown> = {};
  // Only the hashed members: a stored row may carry more (an id, a partition key).
  for (const member of HASHED_EVENT_MEMBERS) body[member] = event[member];
  return canonicalJson({ record: 'event', body, hash: event.hash });
}

/** One daily seal as an audit line: `{"body":{"day",…},"hash":"…","record":"seal"}`, canonical JSON. */
export function auditSealLine(seal: Seal): string {
  const body: SealBody = { v: seal.v, day: seal.day, heads: seal.heads, prevSeal: seal.prevSeal };
  return canonicalJson({ record: 'seal', body, hash: seal.hash });
}

/** The first problem an audit check found. `line` is 1-based. */
export type AuditBreak = {
  line: number;
  record: 'header' | 'event' | 'seal';
  reason: 'unreadable-line' | 'line-out-of-place' | 'out-of-scope' | ChainBreakReason | SealBreakReason;
  message: string;
  item: string | null;
  seq: number | null;
  day: string | null;
  expected: string | number | null;
  actual: string | number | null;
  /** For heads-differ: the items whose sealed and recomputed heads differ. */
  items: HeadDifference[];
};

/** What an audit check reports. */
export type AuditReport =
  | { ok: true; eventsChecked: number; sealsChecked: number; lastSeal: { day: string; hash: string } | null }
  | { ok: false; eventsChecked: number; sealsChecked: number; firstBreak: AuditBreak };

function lineBreak(line: number, record: AuditBreak['record'], reason: AuditBreak['reason'], message: string): AuditBreak {
  return { line, record, reason, message, item: null, seq: null, day: null, expected: null, actual: null, items: [] };
}

/**
 * Checks an audit export (JSON Lines: a header, then event lines, then seal lines, oldest first)
 * without the application: every event hash and chain link, then every seal against the events.
 * Reports the first problem with its line number.
 */
export function verifyAuditJsonl(text: string): AuditReport {
  const lines = text.split('\n');
  if (lines.at(-1) === '') lines.pop();
  const events: LedgerEvent[] = [];
  const eventLines: number[] = [];
  const seals: Seal[] = [];
  const sealLines: number[] = [];
  let header: AuditHeader | null = null;
  const fail = (firstBreak: AuditBreak): AuditReport => ({ ok: false, eventsChecked: 0, sealsChecked: 0, firstBreak });

  for (let index = 0; index < lines.length; index++) {
    const number = index + 1;
    const failHere = (record: AuditBreak['record'], reason: AuditBreak['reason'], problem: string) =>
      fail(lineBreak(number, record, reason, `Line ${number}: ${problem}`));
    let value: unknown;
    try {
      value = JSON.parse(lines[index]);
    } catch {
      return failHere(index === 0 ? 'header' : 'event', 'unreadable-line', 'not JSON');
    }
    if (index === 0) {
      const parsed = AuditHeader.safeParse(value);
      if (!parsed.success) {
        return failHere('header', 'unreadable-line', `not a ${AUDIT_FORMAT} v${AUDIT_FORMAT_VERSION} header`);
      }
      header = parsed.data;
      continue;
    }
    const event = EventLine.safeParse(value);
    if (event.success) {
      if (seals.length > 0) return failHere('event', 'line-out-of-place', 'event lines must come before seal lines');
      // The parsed line, not zod's copy: the hash must be checked over exactly what was read.
      const raw = value as { body: HashedEvent; hash: string };
      const extra = Object.keys(raw.body).filter((key) => !EVENT_MEMBERS.includes(key));
      if (extra.length > 0) {
        // A member outside the hash could be changed freely, so it may not be there at all.
        return failHere('event', 'invalid-event', `body has members the hash does not cover: ${extra.join(', ')}`);
      }
      const ledgerEvent: LedgerEvent = { ...raw.body, hash: raw.hash };
      if (header?.items != null && !header.items.includes(String(ledgerEvent.item))) {
        return failHere('event', 'out-of-scope', `${String(ledgerEvent.item)} is not among the header's items`);
      }
      events.push(ledgerEvent);
      eventLines.push(number);
      continue;
    }
    const seal = SealLine.safeParse(value);
    if (seal.success) {
      const raw = value as { body: SealBody; hash: string };
      const extra = Object.keys(raw.body).filter((key) => !SEAL_MEMBERS.includes(key));
      if (extra.length > 0) {
        return failHere('seal', 'invalid-seal', `seal body has members the hash does not cover: ${extra.join(', ')}`);
      }
      seals.push({ ...raw.body, hash: raw.hash });
      sealLines.push(number);
      continue;
    }
    return failHere('event', 'unreadable-line', 'neither an event nor a seal line');
  }
  if (header === null) return fail(lineBreak(1, 'header', 'unreadable-line', 'The export is empty'));

  const chain = verifyChain(events);
  if (!chain.ok) {
    const b = chain.firstBreak;
    return {
      ok: false,
      eventsChecked: chain.eventsChecked,
      sealsChecked: 0,
      firstBreak: {
        ...lineBreak(eventLines[b.eventIndex], 'event', b.reason, b.message),
        item: b.item,
        seq: b.seq,
        expected: b.expected,
        actual: b.actual,
      },
    };
  }
  const sealed = verifySeals(seals, events, {
    firstPrevSeal: header.firstPrevSeal,
    ...(header.items === null ? {} : { items: header.items }),
  });
  if (!sealed.ok) {
    const b = sealed.firstBreak;
    return {
      ok: false,
      eventsChecked: events.length,
      sealsChecked: sealed.sealsChecked,
      firstBreak: {
        ...lineBreak(sealLines[b.sealIndex], 'seal', b.reason, b.message),
        day: b.day,
        expected: b.expected,
        actual: b.actual,
        items: b.items,
      },
    };
  }
  const last = seals.at(-1);
  return {
    ok: true,
    eventsChecked: events.length,
    sealsChecked: seals.length,
    lastSeal: last === undefined ? null : { day: last.day, hash: last.hash },
  };
}
