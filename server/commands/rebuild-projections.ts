/**
 * Rebuilds every item's projection from the ledger alone into a scratch table and compares it,
 * in SQL, with what is stored beside the ledger (items.state, container, station, last_seq,
 * head_hash and the projection document). The stored projections are never changed here: a
 * difference is reported.
 */
import { QueryTypes, Transaction, type Sequelize } from 'sequelize';
import { emptyProjection, replay, type ItemKind, type Projection } from '../../shared/domain/ledger/state-machine';
import { EVENT_COLUMNS } from '../ledger/sql';
import { eventFromRow, type EventRow } from '../ledger/rows';

/** One field of one item whose stored value differs from the rebuilt one. */
export interface ProjectionDifference {
  item: string;
  field: 'state' | 'container' | 'station' | 'last_seq' | 'head_hash' | 'projection' | 'replay';
  stored: unknown;
  rebuilt: unknown;
}

/** What a rebuild found. */
export interface RebuildReport {
  itemsChecked: number;
  eventsReplayed: number;
  differences: ProjectionDifference[];
}

/**
 * The temporary table the rebuilt projections go to: one row per item, shaped like the
 * projection columns of `items`, private to the rebuild's connection and dropped with its
 * transaction.
 */
export const REBUILD_SCRATCH_TABLE = 'rebuilt_items';

interface ItemRow {
  id: string;
  code: string;
  kind: ItemKind;
}

/** One rebuilt row as it goes into the scratch table (ids are looked up from the codes there). */
interface RebuiltRow {
  item_id: string;
  events: number;
  refusal: string | null;
  state: string | null;
  container_code: string | null;
  station_code: string | null;
  last_seq: number | null;
  head_hash: string | null;
  projection: Projection | null;
}

const CHUNK_ITEMS = 2_000;

const CREATE_SCRATCH_SQL = `
  CREATE TEMPORARY TABLE ${REBUILD_SCRATCH_TABLE} (
    item_id         bigint PRIMARY KEY,
    -- Events replayed; with none, head_hash is not compared (a new item stores no head yet).
    events          integer NOT NULL,
    -- Why the state machine refused the ledger of the item; the other columns are then empty.
    refusal         text,
    state           text,
    container_id    bigint,
    container_code  text,
    station_id      integer,
    station_code    text,
    last_seq        integer,
    head_hash       char(64),
    projection      jsonb
  ) ON COMMIT DROP`;

/**
 * One chunk's rebuilt rows in one statement. Container and station ids come from their codes,
 * as the ledger's writes set them. $1 rows (JSON).
 */
const INSERT_SCRATCH_SQL = `
  INSERT INTO pg_temp.${REBUILD_SCRATCH_TABLE}
    (item_id, events, refusal, state, container_id, container_code, station_id, station_code, last_seq, head_hash, projection)
  SELECT r.item_id, r.events, r.refusal, r.state, c.id, r.container_code, s.id, r.station_code, r.last_seq, r.head_hash, r.projection
    FROM jsonb_to_recordset($1::jsonb) AS r(item_id bigint, events integer, refusal text, state text, container_code text,
         station_code text, last_seq integer, head_hash text, projection jsonb)
    LEFT JOIN items c ON c.code = r.container_code
    LEFT JOIN stations s ON s.code = r.station_code`;

/**
 * Stored against rebuilt, one row per differing field, in item then field order. A stored
 * projection document that was never written ('{}') stands for the empty projection, built
 * from $1 (the empty projection of no item) with the item's kind and code. An item whose
 * replay was refused reports only the refusal. $1 empty projection (JSON), $2 limit.
 */
const COMPARE_SQL = `
  SELECT i.code AS item, f.field, f.stored, f.rebuilt
    FROM items i
    JOIN pg_temp.${REBUILD_SCRATCH_TABLE} r ON r.item_id = i.id
    LEFT JOIN items c ON c.id = i.container_id
    LEFT JOIN stations s ON s.id = i.station_id
    CROSS JOIN LATERAL (
      SELECT CASE WHEN i.projection ? 'state' THEN i.projection
                  ELSE $1::jsonb || jsonb_build_object('kind', i.kind, 'item', i.code) END AS projection
    ) sp
    CROSS JOIN LATERAL (VALUES
      (0, 'replay', NULL::jsonb, to_jsonb(r.refusal), r.refusal IS NOT NULL),
      (1, 'state', to_jsonb(i.state), to_jsonb(r.state), i.state IS DISTINCT FROM r.state),
      -- The id is what is stored and the code what is reported; a rebuilt code naming no
      -- container has no id, so both are compared.
      (2, 'container', to_jsonb(c.code), to_jsonb(r.container_code),
          (i.container_id, c.code) IS DISTINCT FROM (r.container_id, r.container_code)),
      (3, 'station', to_jsonb(s.code), to_jsonb(r.station_code),
          (i.station_id, s.code) IS DISTINCT FROM (r.station_id, r.station_code)),
      (4, 'last_seq', to_jsonb(i.last_seq), to_jsonb(r.last_seq), i.last_seq IS DISTINCT FROM r.last_seq),
      (5, 'head_hash', to_jsonb(i.head_hash), to_jsonb(r.head_hash), r.events > 0 AND i.head_hash IS DISTINCT FROM r.head_hash),
      (6, 'projection', sp.projection, r.projection, sp.projection IS DISTINCT FROM r.projection)
    ) AS f(ord, field, stored, rebuilt, differs)
   WHERE f.differs AND (f.field = 'replay' OR r.refusal IS NULL)
   ORDER BY i.id, f.ord
   LIMIT $2`;

/** Replays one item's events, or gives its empty projection when it has none. */
function rebuildItem(item: ItemRow, events: ReturnType<typeof eventFromRow>[]): RebuiltRow {
  const row = { item_id: item.id, events: events.length };
  let projection: Projection;
  if (events.length === 0) {
    projection = emptyProjection(item.kind, item.code);
  } else {
    const result = replay(item.kind, events);
    if (!result.ok) {
      return {
        ...row,
        refusal: `event ${result.eventIndex + 1} refused: ${result.refusal.message}`,
        state: null,
        container_code: null,
        station_code: null,
        last_seq: null,
        head_hash: null,
        projection: null,
      };
    }
    projection = result.projection;
  }
  return {
    ...row,
    refusal: null,
    state: projection.state,
    container_code: projection.container,
    station_code: projection.station,
    last_seq: projection.lastSeq,
    head_hash: projection.headHash,
    projection,
  };
}

/**
 * Replays each item's events through the state machine (shared/domain/ledger/state-machine.ts),
 * a chunk of items at a time so memory stays bounded, inserts each chunk's rebuilt projections
 * into a temporary table with one statement, and lists every field that differs from the stored
 * one with one query. Everything runs in one REPEATABLE READ transaction, so the items and
 * events all come from one snapshot; once the scratch table exists the transaction is made READ
 * ONLY (PostgreSQL still lets it write its temporary table), and it is rolled back at the end,
 * which drops the table. Needs the TEMPORARY privilege on the database, which PostgreSQL gives
 * every role by default. `limit` caps how many differences are kept.
 */
export async function rebuildProjections(sequelize: Sequelize, limit = 1_000): Promise<RebuildReport> {
  const transaction = await sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ });
  try {
    await sequelize.query(CREATE_SCRATCH_SQL, { transaction });
    await sequelize.query('SET TRANSACTION READ ONLY', { transaction });
    let itemsChecked = 0;
    let eventsReplayed = 0;
    let lastId = 0;
    for (;;) {
      const items = await sequelize.query<ItemRow>(
        `SELECT i.id, i.code, i.kind FROM items i WHERE i.id > $1 ORDER BY i.id LIMIT $2`,
        { bind: [lastId, CHUNK_ITEMS], type: QueryTypes.SELECT, transaction },
      );
      if (items.length === 0) break;
      const first = Number(items[0]?.id);
      lastId = Number(items.at(-1)?.id);
      const rows = await sequelize.query<EventRow & { item_id: string }>(
        `SELECT ${EVENT_COLUMNS}, e.item_id FROM custody_events e WHERE e.item_id BETWEEN $1 AND $2 ORDER BY e.item_id, e.seq`,
        { bind: [first, lastId], type: QueryTypes.SELECT, transaction },
      );
      const byItem = new Map<string, ReturnType<typeof eventFromRow>[]>();
      for (const row of rows) {
        const list = byItem.get(String(row.item_id)) ?? [];
        list.push(eventFromRow(row));
        byItem.set(String(row.item_id), list);
      }
      const rebuilt = items.map((item) => rebuildItem(item, byItem.get(String(item.id)) ?? []));
      itemsChecked += items.length;
      eventsReplayed += rows.length;
      await sequelize.query(INSERT_SCRATCH_SQL, { bind: [JSON.stringify(rebuilt)], transaction });
    }
    const template = emptyProjection('specimen');
    const differences = await sequelize.query<ProjectionDifference>(COMPARE_SQL, {
      bind: [JSON.stringify(template), limit],
      type: QueryTypes.SELECT,
      transaction,
    });
    return { itemsChecked, eventsReplayed, differences };
  } finally {
    await transaction.rollback();
  }
}
