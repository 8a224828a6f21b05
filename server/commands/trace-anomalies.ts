/**
 * Anomalies across the whole lab judged afresh: every item's chain read a chunk at a time, each
 * judged by the same detector the item page uses, with every half's placements to hand so a piece
 * claimed by two codes, or in two places, shows on both. GET /api/anomalies answers from stored
 * findings instead (anomaly-findings.ts); this full computation is what they must equal.
 */
import { QueryTypes, type Sequelize } from 'sequelize';
import type { AnomalySeverity } from '../../shared/domain/anomalies';
import type { ItemKind } from '../../shared/domain/ledger/state-machine';
import type { AnomalyListQuery, AnomalyPage, LabAnomaly } from '../../shared/schemas/trace';
import type { EventView } from '../ledger/types';
import { anomaliesOf, halfPlacements, loadAnomalySetting, loadEvents, type ScopeItem } from './trace';

const CHUNK_ITEMS = 2_000;
const SEVERITY_RANK: Record<AnomalySeverity, number> = { info: 0, warning: 1, critical: 2 };

/** Every item with its events, read in chunks of items (ids ascending). */
async function everyItem(sequelize: Sequelize): Promise<{ items: ScopeItem[]; events: Map<string, EventView[]> }> {
  const items: ScopeItem[] = [];
  const events = new Map<string, EventView[]>();
  let lastId = 0;
  for (;;) {
    const rows = await sequelize.query<{ id: string; code: string; kind: ItemKind; state: string }>(
      'SELECT id, code, kind, state FROM items WHERE id > $1 ORDER BY id LIMIT $2',
      { bind: [lastId, CHUNK_ITEMS], type: QueryTypes.SELECT },
    );
    if (rows.length === 0) break;
    lastId = Number(rows.at(-1)?.id);
    const chunk: ScopeItem[] = rows.map((r) => ({ id: Number(r.id), code: r.code, kind: r.kind, role: 'self', state: r.state }));
    for (const [code, list] of await loadEvents(sequelize, chunk)) events.set(code, list);
    items.push(...chunk);
  }
  return { items, events };
}

/**
 * Every anomaly in the lab judged at `now`, most serious first (then by item code and event), one
 * page of them, with counts per severity over all of them: the answer GET /api/anomalies gives
 * from its stored findings, computed the slow way.
 */
export async function labAnomalies(sequelize: Sequelize, query: AnomalyListQuery, now = new Date()): Promise<AnomalyPage> {
  const { items, events } = await everyItem(sequelize);
  const setting = await loadAnomalySetting(sequelize, items.filter((i) => i.kind === 'specimen').map((i) => i.id));
  const placements = halfPlacements(items, events);
  const byCode = new Map(items.map((i) => [i.code, i]));
  const all: LabAnomaly[] = anomaliesOf(items, events, setting, placements, now).map((a) => ({
    ...a,
    kind: byCode.get(a.item)?.kind ?? 'specimen',
    state: byCode.get(a.item)?.state ?? 'none',
  }));
  const counts = { info: 0, warning: 0, critical: 0 };
  for (const a of all) counts[a.severity]++;
  const filtered = all
    .filter((a) => (query.severity === undefined || a.severity === query.severity) && (query.code === undefined || a.code === query.code))
    .sort(
      (a, b) =>
        SEVERITY_RANK[b.severity] - SEVERITY_RANK[a.severity] ||
        (a.item < b.item ? -1 : a.item > b.item ? 1 : 0) ||
        (a.eventSeq ?? Number.MAX_SAFE_INTEGER) - (b.eventSeq ?? Number.MAX_SAFE_INTEGER),
    );
  const start = (query.page - 1) * query.pageSize;
  return {
    items: filtered.slice(start, start + query.pageSize),
    total: filtered.length,
    page: query.page,
    pageSize: query.pageSize,
    counts,
    itemsChecked: items.length,
    checkedAt: now.toISOString(),
  };
}
