/** Reading items for the API: what a scanned code is, where it is, and what may come next. */
import { QueryTypes, type Sequelize } from 'sequelize';
import { parseCode } from '../../shared/domain/codes';
import { verifyChain } from '../../shared/domain/ledger/event-hash';
import { allowedNext, describeState, type EventType, type ItemKind, type ProjectionState } from '../../shared/domain/ledger/state-machine';
import { notFound, unprocessable } from '../errors';
import { EVENT_COLUMNS } from './sql';
import { eventFromRow, type EventRow } from './rows';
import type { EventView } from './types';

/** One container around an item, innermost first. */
export interface LocationStep {
  code: string;
  containerType: string;
  name: string;
  state: string;
}

/** An item as GET /api/items/:code answers. */
export interface ItemView {
  kind: ItemKind;
  id: number;
  code: string;
  state: ProjectionState;
  stateLabel: string;
  allowed: EventType[];
  lastSeq: number;
  headHash: string | null;
  lastEventAt: string | null;
  location: { station: { code: string; name: string } | null; containers: LocationStep[]; text: string };
  specimen?: { geometryKey: string; shape: string; testStandard: string; sample: string | null; order: string | null; heat: string | null };
  half?: { side: 'A' | 'B'; specimen: string | null };
  halves?: { code: string; side: 'A' | 'B'; state: string }[];
  container?: { containerType: string; name: string; binHalf: 'A' | 'B' | null; contents: number };
}

/** A badge code's answer: the person it belongs to. */
export interface BadgeView {
  kind: 'badge';
  code: string;
  user: { id: number; name: string; role: string; active: boolean };
}

/** Parses a code from a URL: 422 with the check-character message when it does not read. */
export function codeFromParam(raw: string): ReturnType<typeof parseCode> & { ok: true } {
  const parsed = parseCode(raw);
  if (!parsed.ok) throw unprocessable(parsed.message, [{ path: 'code', message: parsed.message }]);
  return parsed;
}

/** The containers around a container item (itself first), following the nesting upwards. */
export async function containerChain(sequelize: Sequelize, containerId: number | null): Promise<LocationStep[]> {
  if (containerId === null) return [];
  return sequelize.query<LocationStep>(
    `WITH RECURSIVE up(id, depth) AS (
       SELECT $1::bigint, 0
       UNION ALL SELECT i.container_id, up.depth + 1 FROM items i JOIN up ON i.id = up.id
        WHERE i.container_id IS NOT NULL AND up.depth < 64)
     SELECT i.code, c.container_type AS "containerType", c.name, i.state
       FROM up JOIN items i ON i.id = up.id JOIN containers c ON c.item_id = i.id ORDER BY up.depth`,
    { bind: [containerId], type: QueryTypes.SELECT },
  );
}

interface ItemRow {
  id: string;
  code: string;
  kind: ItemKind;
  state: ProjectionState;
  last_seq: number;
  head_hash: string | null;
  last_event_at: string | null;
  container_id: string | null;
  parent_item_id: string | null;
  half: 'A' | 'B' | null;
  station_code: string | null;
  station_name: string | null;
}

/** Resolves any scanned code to its item (or badge holder): 404 for an unknown code. */
export async function readItem(sequelize: Sequelize, raw: string): Promise<ItemView | BadgeView> {
  const parsed = codeFromParam(raw);
  const q = <T extends object>(sql: string, bind: unknown[]) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
  if (parsed.kind === 'badge') {
    const [user] = await q<{ id: number; name: string; role: string; active: boolean }>(
      'SELECT id, name, role, active FROM users WHERE badge_code = $1',
      [parsed.code],
    );
    if (!user) throw notFound(`No one holds the badge ${parsed.code}.`);
    return { kind: 'badge', code: parsed.code, user };
  }
  const [row] = await q<ItemRow>(
    `SELECT i.id, i.code, i.kind, i.state, i.last_seq, i.head_hash, i.container_id, i.parent_item_id, i.half,
            to_char(i.last_event_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS last_event_at,
            s.code AS station_code, s.name AS station_name
       FROM items i LEFT JOIN stations s ON s.id = i.station_id WHERE i.code = $1`,
    [parsed.code],
  );
  if (!row) throw notFound(`No item has the code ${parsed.code}. Check the label, or register the item first.`);
  const id = Number(row.id);
  const containers = await containerChain(sequelize, row.container_id === null ? null : Number(row.container_id));
  const view: ItemView = {
    kind: row.kind,
    id,
    code: row.code,
    state: row.state,
    stateLabel: describeState(row.state),
    allowed: allowedNext(row.kind, row.state),
    lastSeq: row.last_seq,
    headHash: row.head_hash,
    lastEventAt: row.last_event_at,
    location: {
      station: row.station_code === null ? null : { code: row.station_code, name: row.station_name ?? row.station_code },
      containers,
      text: containers.map((c) => `${c.name} (${c.code})`).join(' › ') || (row.station_code ?? 'no container'),
    },
  };
  if (row.kind === 'specimen') {
    const [s] = await q<{ geometry_key: string; shape: string; test_standard: string; sample: string | null; order: string | null; heat: string | null }>(
      `SELECT s.geometry_key, s.shape, s.test_standard, sa.code AS sample, o.number AS "order", h.heat_number AS heat
         FROM specimens s LEFT JOIN samples sa ON sa.id = s.sample_id LEFT JOIN orders o ON o.id = sa.order_id
         LEFT JOIN heats h ON h.id = sa.heat_id WHERE s.item_id = $1`,
      [id],
    );
    if (s) view.specimen = { geometryKey: s.geometry_key, shape: s.shape, testStandard: s.test_standard, sample: s.sample, order: s.order, heat: s.heat };
    view.halves = await q<{ code: string; side: 'A' | 'B'; state: string }>(
      `SELECT code, half AS side, state FROM items WHERE parent_item_id = $1 AND kind = 'half' ORDER BY half`,
      [id],
    );
  } else if (row.kind === 'half') {
    const [parent] = await q<{ code: string }>('SELECT code FROM items WHERE id = $1', [row.parent_item_id]);
    view.half = { side: row.half ?? 'A', specimen: parent?.code ?? null };
  } else {
    const [c] = await q<{ container_type: string; name: string; bin_half: 'A' | 'B' | null; contents: number }>(
      `SELECT c.container_type, c.name, c.bin_half, (SELECT count(*)::integer FROM items WHERE container_id = $1) AS contents
         FROM containers c WHERE c.item_id = $1`,
      [id],
    );
    if (c) view.container = { containerType: c.container_type, name: c.name, binHalf: c.bin_half, contents: c.contents };
  }
  return view;
}

/** An item's events in seq order, which of them a void cancelled, and whether its chain verifies. */
export async function readItemEvents(
  sequelize: Sequelize,
  raw: string,
  page: { after: number; limit: number },
): Promise<{ item: string; events: EventView[]; cancelled: string[]; chain: ReturnType<typeof verifyChain> | null; more: boolean }> {
  const parsed = codeFromParam(raw);
  const [item] = await sequelize.query<{ id: string; code: string }>('SELECT id, code FROM items WHERE code = $1', {
    bind: [parsed.code],
    type: QueryTypes.SELECT,
  });
  if (!item) throw notFound(`No item has the code ${parsed.code}.`);
  const rows = await sequelize.query<EventRow>(
    `SELECT ${EVENT_COLUMNS} FROM custody_events e WHERE e.item_id = $1 AND e.seq > $2 ORDER BY e.seq LIMIT $3`,
    { bind: [item.id, page.after, page.limit + 1], type: QueryTypes.SELECT },
  );
  const more = rows.length > page.limit;
  const events = rows.slice(0, page.limit).map(eventFromRow);
  const cancelled = events.flatMap((e) => (e.type === 'voided' && e.corrects !== null ? [e.corrects] : []));
  // The chain can only be checked from its start.
  const chain = page.after === 0 && !more ? verifyChain(events) : null;
  return { item: item.code, events, cancelled, chain, more };
}
