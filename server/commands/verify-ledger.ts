/**
 * The ledger verifier: recomputes every event hash and every chain link, every daily seal, and
 * checks each item's recorded chain head; names the first break (event, item, what differs).
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { verifyChain, type ChainBreakReason } from '../../shared/domain/ledger/event-hash';
import { verifySeals, type HeadDifference, type SealableEvent, type SealBreakReason } from '../../shared/domain/ledger/seal';
import { EVENT_COLUMNS } from '../ledger/sql';
import { eventFromRow, type EventRow } from '../ledger/rows';
import { loadSeals } from './seal-day';

/** The first break the verifier found. */
export interface LedgerBreak {
  /** Which check failed: an event chain, a daily seal, or an item's recorded head. */
  check: 'chain' | 'seal' | 'head';
  reason: ChainBreakReason | SealBreakReason | 'head-mismatch';
  message: string;
  /** The custody_events row id of the event, where one is named. */
  eventId: number | null;
  item: string | null;
  seq: number | null;
  day: string | null;
  expected: string | number | null;
  actual: string | number | null;
  /** For a seal's heads-differ: every item whose sealed head differs from the ledger's. */
  items: HeadDifference[];
}

/** What GET /api/ledger/verify and npm run ledger:verify report. */
export interface LedgerVerification {
  ok: boolean;
  eventsChecked: number;
  sealsChecked: number;
  firstBreak: LedgerBreak | null;
}

const CHUNK_ITEMS = 2_000;

function blank(check: LedgerBreak['check'], reason: LedgerBreak['reason'], message: string): LedgerBreak {
  return { check, reason, message, eventId: null, item: null, seq: null, day: null, expected: null, actual: null, items: [] };
}

/**
 * Verifies the whole ledger, items in id order, a chunk of items at a time: each chain by the
 * rules of docs/ledger-format.md §2, each item's stored head (items.last_seq and head_hash)
 * against its chain (catches the last events of a chain deleted since the last seal), then the
 * seals by §3 (catches whole chains deleted).
 */
export async function verifyLedger(sequelize: Sequelize): Promise<LedgerVerification> {
  const light: SealableEvent[] = [];
  let eventsChecked = 0;
  let lastId = 0;
  const headsSeen = new Set<string>();
  for (;;) {
    const items = await sequelize.query<{ id: string; code: string; last_seq: number; head_hash: string | null }>(
      'SELECT id, code, last_seq, head_hash FROM items WHERE id > $1 ORDER BY id LIMIT $2',
      { bind: [lastId, CHUNK_ITEMS], type: QueryTypes.SELECT },
    );
    if (items.length === 0) break;
    const first = Number(items[0]?.id);
    lastId = Number(items.at(-1)?.id);
    const rows = await sequelize.query<EventRow & { item_id: string }>(
      `SELECT ${EVENT_COLUMNS}, e.item_id FROM custody_events e WHERE e.item_id BETWEEN $1 AND $2 ORDER BY e.item_id, e.seq, e.id`,
      { bind: [first, lastId], type: QueryTypes.SELECT },
    );
    const events = rows.map(eventFromRow);
    const chain = verifyChain(events);
    if (!chain.ok) {
      const b = chain.firstBreak;
      return {
        ok: false,
        eventsChecked: eventsChecked + chain.eventsChecked,
        sealsChecked: 0,
        firstBreak: {
          ...blank('chain', b.reason, b.message),
          eventId: events[b.eventIndex]?.id ?? null,
          item: b.item,
          seq: b.seq,
          expected: b.expected,
          actual: b.actual,
        },
      };
    }
    eventsChecked += events.length;
    const heads = new Map(chain.heads.map((h) => [h.item, h]));
    for (const item of items) {
      const head = heads.get(item.code);
      headsSeen.add(item.code);
      const recomputedSeq = head?.seq ?? 0;
      if (recomputedSeq !== item.last_seq || (head !== undefined && head.hash !== item.head_hash)) {
        return {
          ok: false,
          eventsChecked,
          sealsChecked: 0,
          firstBreak: {
            ...blank('head', 'head-mismatch', `${item.code}: the item's recorded head is seq ${item.last_seq}, but its chain ends at seq ${recomputedSeq}`),
            item: item.code,
            seq: item.last_seq,
            expected: `${item.last_seq}:${item.head_hash ?? ''}`,
            actual: `${recomputedSeq}:${head?.hash ?? ''}`,
          },
        };
      }
    }
    for (const e of events) light.push({ item: e.item, seq: e.seq, hash: e.hash, recordedAt: e.recordedAt });
  }
  // Events whose item row is gone are outside the item walk; count them as a break.
  const [orphan] = await sequelize.query<{ id: string; item_code: string; seq: number }>(
    'SELECT e.id, e.item_code, e.seq FROM custody_events e LEFT JOIN items i ON i.id = e.item_id WHERE i.id IS NULL LIMIT 1',
    { type: QueryTypes.SELECT },
  );
  if (orphan) {
    return {
      ok: false,
      eventsChecked,
      sealsChecked: 0,
      firstBreak: { ...blank('chain', 'invalid-event', `${orphan.item_code} seq ${orphan.seq}: the event's item does not exist`), eventId: Number(orphan.id), item: orphan.item_code, seq: orphan.seq },
    };
  }

  const stored = await loadSeals(sequelize);
  for (const [index, s] of stored.entries()) {
    if (s.day !== s.seal.day || s.prevHash !== s.seal.prevSeal) {
      return {
        ok: false,
        eventsChecked,
        sealsChecked: index,
        firstBreak: {
          ...blank('seal', 'invalid-seal', `Seal row for ${s.day}: its day or prev_hash column differs from its body`),
          day: s.day,
          expected: `${s.seal.day}:${s.seal.prevSeal}`,
          actual: `${s.day}:${s.prevHash}`,
        },
      };
    }
  }
  const seals = verifySeals(
    stored.map((s) => s.seal),
    light,
  );
  if (!seals.ok) {
    const b = seals.firstBreak;
    return {
      ok: false,
      eventsChecked,
      sealsChecked: seals.sealsChecked,
      firstBreak: { ...blank('seal', b.reason, b.message), day: b.day, expected: b.expected, actual: b.actual, items: b.items, item: b.items[0]?.item ?? null },
    };
  }
  return { ok: true, eventsChecked, sealsChecked: seals.sealsChecked, firstBreak: null };
}
