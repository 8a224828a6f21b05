/**
 * Rebuilds every item's projection from the ledger alone and compares it with what is stored
 * beside the ledger (items.state, container, station, last_seq, head_hash and the projection
 * document). The stored projections are never changed here: a difference is reported.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import { canonicalJson } from '../../shared/domain/ledger/canonical';
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

interface StoredItem {
  id: string;
  code: string;
  kind: ItemKind;
  state: string;
  projection: Projection | Record<string, never>;
  last_seq: number;
  head_hash: string | null;
  container_code: string | null;
  station_code: string | null;
}

const CHUNK_ITEMS = 2_000;

/**
 * Replays each item's events through the state machine (shared/domain/ledger/state-machine.ts),
 * a chunk of items at a time so memory stays bounded, and lists every field that differs.
 * `limit` caps how many differences are kept.
 */
export async function rebuildProjections(sequelize: Sequelize, limit = 1_000): Promise<RebuildReport> {
  const differences: ProjectionDifference[] = [];
  let itemsChecked = 0;
  let eventsReplayed = 0;
  let lastId = 0;
  for (;;) {
    const items = await sequelize.query<StoredItem>(
      `SELECT i.id, i.code, i.kind, i.state, i.projection, i.last_seq, i.head_hash, c.code AS container_code, s.code AS station_code
         FROM items i LEFT JOIN items c ON c.id = i.container_id LEFT JOIN stations s ON s.id = i.station_id
        WHERE i.id > $1 ORDER BY i.id LIMIT $2`,
      { bind: [lastId, CHUNK_ITEMS], type: QueryTypes.SELECT },
    );
    if (items.length === 0) break;
    const first = Number(items[0]?.id);
    lastId = Number(items.at(-1)?.id);
    const rows = await sequelize.query<EventRow & { item_id: string }>(
      `SELECT ${EVENT_COLUMNS}, e.item_id FROM custody_events e WHERE e.item_id BETWEEN $1 AND $2 ORDER BY e.item_id, e.seq`,
      { bind: [first, lastId], type: QueryTypes.SELECT },
    );
    const byItem = new Map<string, ReturnType<typeof eventFromRow>[]>();
    for (const row of rows) {
      const list = byItem.get(String(row.item_id)) ?? [];
      list.push(eventFromRow(row));
      byItem.set(String(row.item_id), list);
    }
    for (const item of items) {
      itemsChecked++;
      const events = byItem.get(String(item.id)) ?? [];
      eventsReplayed += events.length;
      const note = (field: ProjectionDifference['field'], stored: unknown, rebuilt: unknown) => {
        if (differences.length < limit) differences.push({ item: item.code, field, stored, rebuilt });
      };
      let rebuilt: Projection;
      if (events.length === 0) {
        rebuilt = emptyProjection(item.kind, item.code);
      } else {
        const result = replay(item.kind, events);
        if (!result.ok) {
          note('replay', null, `event ${result.eventIndex + 1} refused: ${result.refusal.message}`);
          continue;
        }
        rebuilt = result.projection;
      }
      if (item.state !== rebuilt.state) note('state', item.state, rebuilt.state);
      if (item.container_code !== rebuilt.container) note('container', item.container_code, rebuilt.container);
      if (item.station_code !== rebuilt.station) note('station', item.station_code, rebuilt.station);
      if (item.last_seq !== rebuilt.lastSeq) note('last_seq', item.last_seq, rebuilt.lastSeq);
      if (events.length > 0 && item.head_hash !== rebuilt.headHash) note('head_hash', item.head_hash, rebuilt.headHash);
      const storedProjection = 'state' in item.projection ? item.projection : emptyProjection(item.kind, item.code);
      if (canonicalJson(storedProjection) !== canonicalJson(rebuilt)) note('projection', storedProjection, rebuilt);
    }
  }
  return { itemsChecked, eventsReplayed, differences };
}
