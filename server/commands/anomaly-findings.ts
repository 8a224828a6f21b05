/**
 * The lab-wide anomaly list as stored findings. A sweep judges again only the items whose
 * judgement may be out of date, with the same detector and inputs the item page uses, and
 * replaces their rows in one transaction; GET /api/anomalies sweeps when something is due, then
 * reads its page with SQL.
 *
 * An item is due when its projection row moved on (a new event, a void, a rebuilt state), an
 * event above the sweep's watermark names it, its order's conditioning rule or its sample's
 * thickness changed, a station it stood at changed kind, or the time until which its judgement
 * holds has come (anomalyClock: a stay reaching its dwell limit, an open placement growing into an
 * overlap). Items tied to a due half through the piece it claims are judged with it, since
 * "claimed twice" is found on both. A long dwell or an overlap still growing is re-worded at read
 * time, so its hours are those of the stated check time. Every due item's whole chain is
 * re-verified; tampering with old rows of items that did not move is the ledger verifier's to find
 * (GET /api/ledger/verify), and a full sweep (`?refresh=full`, and after each day is sealed)
 * re-judges everything.
 */
import { QueryTypes, Transaction, type Sequelize } from 'sequelize';
import { anomalyClock, placementsOf, type AnomalyClock, type AnomalySeverity, type Placement } from '../../shared/domain/anomalies';
import type { ItemKind } from '../../shared/domain/ledger/state-machine';
import type { AnomalyListQuery, AnomalyPage, LabAnomaly, TraceAnomaly } from '../../shared/schemas/trace';
import type { EventView } from '../ledger/types';
import { logger } from '../logger';
import { anomaliesOf, loadAnomalySetting, loadEvents, type ScopeItem } from './trace';

/** Key of the advisory lock a sweep holds while it judges and writes (one sweep at a time). */
export const ANOMALY_SWEEP_LOCK_KEY = 7_261_584_311;

const SEVERITY_RANK: Record<AnomalySeverity, number> = { info: 0, warning: 1, critical: 2 };
// Items whose events are read in one query, and rows written in one statement.
const LOAD_CHUNK = 5_000;
const WRITE_CHUNK = 2_000;
// A read that finds work due sweeps once, then answers: exactly as of now when nothing new came
// in meanwhile, else as of that sweep (on a busy floor, scans keep arriving).
const READ_ATTEMPTS = 2;

/** What one sweep did. */
export interface SweepResult {
  full: boolean;
  /** Items judged (again). */
  judged: number;
  /** Findings those items now have. */
  findings: number;
  /** The instant the items were judged at; null when nothing was due. */
  sweptAt: string | null;
  ms: number;
}

// The order's conditioning rule and the sample's thickness, as one value per specimen.
const SETTING_SQL = `CASE WHEN o.conditioning IS NULL THEN NULL
  ELSE md5(o.conditioning::text || '/' || coalesce(sa.thickness_mm::text, '-')) END`;
const ITEMS_FROM = `items i
  LEFT JOIN specimens sp ON sp.item_id = i.id LEFT JOIN samples sa ON sa.id = sp.sample_id LEFT JOIN orders o ON o.id = sa.order_id`;
const MARK_COLUMNS = `i.id, i.code, i.kind, i.state, i.last_seq, i.head_hash, ${SETTING_SQL} AS setting`;
// $1 now. The watermark comes from the sweep row in the same statement.
const DUE_SQL = `(s.item_id IS NULL
  OR s.last_seq <> i.last_seq OR s.head_hash IS DISTINCT FROM i.head_hash OR s.state <> i.state
  OR s.setting IS DISTINCT FROM ${SETTING_SQL}
  OR s.recheck_at <= $1
  OR i.id IN (SELECT e.item_id FROM custody_events e WHERE e.id > (SELECT event_watermark FROM anomaly_sweep_state)))`;
const STATIONS_SQL = `SELECT coalesce(jsonb_object_agg(code, kind), '{}'::jsonb) FROM stations`;

/** An item as its projection row stood when it was picked for judging. */
interface ItemMark {
  id: string;
  code: string;
  kind: ItemKind;
  state: string;
  last_seq: number;
  head_hash: string | null;
  setting: string | null;
}

interface SweepStateRow {
  event_watermark: string;
  stations: Record<string, string>;
  swept_at: Date | null;
  items_checked: number;
}

/** One item judged: its findings in the detector's order, and what the next sweeps need. */
interface Judgement {
  item: ScopeItem;
  findings: TraceAnomaly[];
  piece: string;
  claims: string | null;
  clock: AnomalyClock;
}

const toScope = (r: { id: string | number; code: string; kind: ItemKind; state: string }): ScopeItem => ({
  id: Number(r.id),
  code: r.code,
  kind: r.kind,
  role: 'self',
  state: r.state,
});

/** The piece an item is (as the detector's two-places check names it) and the piece a half claims for others. */
function pieceOf(item: ScopeItem, events: readonly EventView[]): { piece: string; claims: string | null; placements: Placement[] } {
  const placements = placementsOf(item.kind, item.code, events);
  const piece = placements[0]?.piece ?? item.code;
  // Only halves' placements are handed to other items' checks (halfPlacements in trace.ts).
  return { piece, claims: item.kind === 'half' && placements.length > 0 ? piece : null, placements };
}

async function loadEventsChunked(sequelize: Sequelize, items: readonly ScopeItem[], transaction: Transaction): Promise<Map<string, EventView[]>> {
  const all = new Map<string, EventView[]>();
  for (let from = 0; from < items.length; from += LOAD_CHUNK) {
    for (const [code, list] of await loadEvents(sequelize, items.slice(from, from + LOAD_CHUNK), transaction)) all.set(code, list);
  }
  return all;
}

/**
 * Judges some items at `now` as the full list would: each with every half's placements of the
 * piece it is, half claimants taken from `claimants` (items not judged here) and from the judged
 * items themselves, in item id order as the full list hands them over.
 */
async function judge(
  sequelize: Sequelize,
  transaction: Transaction,
  items: readonly ScopeItem[],
  claimants: readonly ScopeItem[],
  events: ReadonlyMap<string, readonly EventView[]>,
  now: Date,
): Promise<Judgement[]> {
  const pieces = new Map<number, ReturnType<typeof pieceOf>>();
  for (const item of [...items, ...claimants]) pieces.set(item.id, pieceOf(item, events.get(item.code) ?? []));
  const byPiece = new Map<string, Placement[]>();
  for (const item of [...items, ...claimants].sort((a, b) => a.id - b.id)) {
    const own = pieces.get(item.id);
    if (own?.claims == null) continue;
    const list = byPiece.get(own.claims) ?? [];
    list.push(...own.placements);
    byPiece.set(own.claims, list);
  }
  const setting = await loadAnomalySetting(
    sequelize,
    items.filter((i) => i.kind === 'specimen').map((i) => i.id),
    transaction,
  );
  return items.map((item) => {
    const own = pieces.get(item.id) ?? pieceOf(item, []);
    const itemEvents = events.get(item.code) ?? [];
    return {
      item,
      // Other pieces' placements cannot change this item's findings, so only its own piece's are passed.
      findings: anomaliesOf([item], events, setting, byPiece.get(own.piece) ?? [], now),
      piece: own.piece,
      claims: own.claims,
      clock: anomalyClock({ item: item.code, kind: item.kind, events: itemEvents, now, stationKinds: setting.stationKinds }),
    };
  });
}

/** Station codes whose kind differs between two code → kind maps (added and removed ones too). */
function changedStations(before: Readonly<Record<string, string>>, after: Readonly<Record<string, string>>): string[] {
  const codes = new Set([...Object.keys(before), ...Object.keys(after)]);
  return [...codes].filter((code) => before[code] !== after[code]).sort();
}

async function writeJudgements(
  sequelize: Sequelize,
  transaction: Transaction,
  judged: readonly Judgement[],
  marks: ReadonlyMap<number, ItemMark>,
  now: Date,
  full: boolean,
): Promise<number> {
  const ids = judged.map((j) => j.item.id);
  if (full) await sequelize.query('DELETE FROM anomaly_findings', { transaction });
  else {
    for (let from = 0; from < ids.length; from += LOAD_CHUNK) {
      await sequelize.query('DELETE FROM anomaly_findings WHERE item_id = ANY($1::bigint[])', {
        bind: [ids.slice(from, from + LOAD_CHUNK)],
        transaction,
      });
    }
  }
  const rows = judged.flatMap((j) =>
    j.findings.map((f, ordinal) => ({
      item_id: j.item.id,
      ordinal,
      item_code: j.item.code,
      kind: j.item.kind,
      state: marks.get(j.item.id)?.state ?? j.item.state,
      severity: f.severity,
      severity_rank: SEVERITY_RANK[f.severity],
      code: f.code,
      event_seq: f.eventSeq ?? null,
      message: f.message,
      // As text, cast to json in SQL: json keeps the detector's own spelling and key order.
      details: JSON.stringify(f.details),
    })),
  );
  for (let from = 0; from < rows.length; from += WRITE_CHUNK) {
    await sequelize.query(
      `INSERT INTO anomaly_findings (item_id, ordinal, item_code, kind, state, severity, severity_rank, code, event_seq, message, details, found_at)
       SELECT item_id, ordinal, item_code, kind, state, severity, severity_rank, code, event_seq, message, details::json, $2
         FROM json_to_recordset($1::json) AS x(item_id bigint, ordinal integer, item_code text, kind text, state text, severity text,
           severity_rank smallint, code text, event_seq integer, message text, details text)`,
      { bind: [JSON.stringify(rows.slice(from, from + WRITE_CHUNK)), now], transaction },
    );
  }
  const states = judged.flatMap((j) => {
    const mark = marks.get(j.item.id);
    if (mark === undefined) return [];
    return [
      {
        item_id: j.item.id,
        last_seq: mark.last_seq,
        head_hash: mark.head_hash,
        state: mark.state,
        setting: mark.setting,
        piece: j.piece,
        claims: j.claims,
        recheck_at: j.clock.changesAt,
        running: j.clock.running,
      },
    ];
  });
  for (let from = 0; from < states.length; from += WRITE_CHUNK) {
    await sequelize.query(
      `INSERT INTO anomaly_item_state (item_id, last_seq, head_hash, state, setting, piece, claims, recheck_at, running, judged_at)
       SELECT item_id, last_seq, head_hash, state, setting, piece, claims, recheck_at, running, $2
         FROM json_to_recordset($1::json) AS x(item_id bigint, last_seq integer, head_hash text, state text, setting text,
           piece text, claims text, recheck_at timestamptz, running boolean)
       ON CONFLICT (item_id) DO UPDATE SET last_seq = EXCLUDED.last_seq, head_hash = EXCLUDED.head_hash, state = EXCLUDED.state,
         setting = EXCLUDED.setting, piece = EXCLUDED.piece, claims = EXCLUDED.claims, recheck_at = EXCLUDED.recheck_at,
         running = EXCLUDED.running, judged_at = EXCLUDED.judged_at`,
      { bind: [JSON.stringify(states.slice(from, from + WRITE_CHUNK)), now], transaction },
    );
  }
  return rows.length;
}

/**
 * Brings the stored findings up to date: judges again every item that is due (every item when
 * `full`), and the items tied to a due half through the piece it claims, at one instant, and
 * replaces their findings in one transaction. Sweeps wait for each other on an advisory lock, so
 * the second of two finds little or nothing left to do. `now` is for tests.
 */
export async function sweepAnomalies(sequelize: Sequelize, opts: { full?: boolean; now?: Date } = {}): Promise<SweepResult> {
  const full = opts.full === true;
  const started = performance.now();
  const result = await sequelize.transaction(async (transaction) => {
    const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, transaction, type: QueryTypes.SELECT });
    await q('SELECT pg_advisory_xact_lock($1)', [ANOMALY_SWEEP_LOCK_KEY]);
    // Taken once the lock is held, so sweeps judge in the order they write.
    const now = opts.now ?? new Date();
    const [state] = await q<SweepStateRow>('SELECT event_watermark, stations, swept_at, items_checked FROM anomaly_sweep_state');
    const [{ stations } = { stations: {} }] = await q<{ stations: Record<string, string> }>(`SELECT (${STATIONS_SQL}) AS stations`);
    const moved = changedStations(state?.stations ?? {}, stations);

    // One statement: the due items' projection rows and the watermark come from one snapshot.
    const due = await q<ItemMark & { old_claims: string | null; watermark: string }>(
      `SELECT ${MARK_COLUMNS}, s.claims AS old_claims,
              (SELECT coalesce(max(id), 0) FROM custody_events) AS watermark
         FROM ${ITEMS_FROM} LEFT JOIN anomaly_item_state s ON s.item_id = i.id
        WHERE $2::boolean OR ${DUE_SQL}${
          // Reading every event for their stations is only worth it when a station changed.
          moved.length > 0 ? ' OR i.id IN (SELECT e.item_id FROM custody_events e WHERE e.station_code = ANY($3::text[]))' : ''
        }
        ORDER BY i.id`,
      moved.length > 0 ? [now, full, moved] : [now, full],
    );
    if (due.length === 0 && moved.length === 0 && !full) return { judged: 0, findings: 0, sweptAt: null };

    const marks = new Map<number, ItemMark>(due.map((r) => [Number(r.id), r]));
    const dueItems = due.map(toScope);
    const events = await loadEventsChunked(sequelize, dueItems, transaction);
    // A due half may have stopped or started claiming a piece: every item of those pieces is judged again.
    const touched = new Set<string>();
    for (const row of due) {
      if (row.old_claims !== null) touched.add(row.old_claims);
      const claims = pieceOf(toScope(row), events.get(row.code) ?? []).claims;
      if (claims !== null) touched.add(claims);
    }
    const tied = touched.size === 0 || full
      ? []
      : await q<ItemMark>(
          `SELECT ${MARK_COLUMNS} FROM ${ITEMS_FROM} JOIN anomaly_item_state s ON s.item_id = i.id
            WHERE s.piece = ANY($1::text[]) AND i.id <> ALL($2::bigint[]) ORDER BY i.id`,
          [[...touched], [...marks.keys()]],
        );
    for (const row of tied) marks.set(Number(row.id), row);
    const tiedItems = tied.map(toScope);
    for (const [code, list] of await loadEventsChunked(sequelize, tiedItems, transaction)) events.set(code, list);
    const judging = [...dueItems, ...tiedItems];

    // Halves not judged here that claim a piece a judged item is: their placements go in as they are.
    const judgedPieces = new Set(judging.map((i) => pieceOf(i, events.get(i.code) ?? []).piece));
    const claimantRows = full
      ? []
      : await q<{ id: string; code: string; kind: ItemKind; state: string }>(
          `SELECT i.id, i.code, i.kind, i.state FROM items i JOIN anomaly_item_state s ON s.item_id = i.id
            WHERE s.claims = ANY($1::text[]) AND i.id <> ALL($2::bigint[]) ORDER BY i.id`,
          [[...judgedPieces], [...marks.keys()]],
        );
    const claimants = claimantRows.map(toScope);
    for (const [code, list] of await loadEventsChunked(sequelize, claimants, transaction)) events.set(code, list);

    const judged = await judge(sequelize, transaction, judging, claimants, events, now);
    const findings = await writeJudgements(sequelize, transaction, judged, marks, now, full);
    const watermark = due[0]?.watermark ?? state?.event_watermark ?? '0';
    await sequelize.query(
      `INSERT INTO anomaly_sweep_state (event_watermark, stations, swept_at, full_swept_at, items_checked, items_judged, sweep_ms)
       VALUES ($1::bigint, $2::jsonb, $3, CASE WHEN $4 THEN $3::timestamptz END, (SELECT count(*) FROM anomaly_item_state), $5, $6)
       ON CONFLICT (id) DO UPDATE SET event_watermark = greatest(anomaly_sweep_state.event_watermark, EXCLUDED.event_watermark),
         stations = EXCLUDED.stations, swept_at = EXCLUDED.swept_at,
         full_swept_at = coalesce(EXCLUDED.full_swept_at, anomaly_sweep_state.full_swept_at),
         items_checked = EXCLUDED.items_checked, items_judged = EXCLUDED.items_judged, sweep_ms = EXCLUDED.sweep_ms`,
      { bind: [watermark, JSON.stringify(stations), now, full, judged.length, Math.round(performance.now() - started)], transaction },
    );
    return { judged: judged.length, findings, sweptAt: now.toISOString() };
  });
  const ms = Math.round(performance.now() - started);
  if (result.judged > 0) logger.info({ full, judged: result.judged, findings: result.findings, ms }, 'anomaly findings swept');
  return { full, ...result, ms };
}

interface FindingRow {
  item_id: string;
  ordinal: number;
  item_code: string;
  kind: string;
  state: string;
  severity: AnomalySeverity;
  code: LabAnomaly['code'];
  event_seq: number | null;
  message: string;
  details: LabAnomaly['details'];
  running: boolean;
}

function toLabAnomaly(row: FindingRow): LabAnomaly {
  return {
    code: row.code,
    severity: row.severity,
    ...(row.event_seq === null ? {} : { eventSeq: row.event_seq }),
    message: row.message,
    details: row.details,
    item: row.item_code,
    kind: row.kind,
    state: row.state,
  };
}

/**
 * A long dwell or an overlap still growing counts its hours up to the check time: the page's rows
 * of such items are worded again at `at`. The findings themselves do not change until the item is due.
 */
async function reword(sequelize: Sequelize, transaction: Transaction, rows: readonly FindingRow[], at: Date): Promise<LabAnomaly[]> {
  const page = rows.map(toLabAnomaly);
  const runningIds = [...new Set(rows.filter((r) => r.running).map((r) => r.item_id))];
  if (runningIds.length === 0) return page;
  const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, transaction, type: QueryTypes.SELECT });
  const items = (
    await q<{ id: string; code: string; kind: ItemKind; state: string; piece: string }>(
      'SELECT i.id, i.code, i.kind, i.state, s.piece FROM items i JOIN anomaly_item_state s ON s.item_id = i.id WHERE i.id = ANY($1::bigint[])',
      [runningIds],
    )
  );
  const claimants = (
    await q<{ id: string; code: string; kind: ItemKind; state: string }>(
      `SELECT i.id, i.code, i.kind, i.state FROM items i JOIN anomaly_item_state s ON s.item_id = i.id
        WHERE s.claims = ANY($1::text[]) AND i.id <> ALL($2::bigint[])`,
      [items.map((i) => i.piece), runningIds],
    )
  ).map(toScope);
  const scope = items.map(toScope);
  const events = await loadEvents(sequelize, [...scope, ...claimants], transaction);
  const fresh = new Map((await judge(sequelize, transaction, scope, claimants, events, at)).map((j) => [String(j.item.id), j.findings]));
  return rows.map((row, index) => {
    const stored = page[index]!;
    if (!row.running) return stored;
    const now = fresh.get(row.item_id)?.[row.ordinal];
    if (now === undefined || now.code !== row.code || now.severity !== row.severity || (now.eventSeq ?? null) !== row.event_seq) {
      // The item moved on after this snapshot's sweep; the next request judges it again.
      logger.warn({ item: row.item_code, ordinal: row.ordinal }, 'a running anomaly no longer matches its stored finding');
      return stored;
    }
    return { ...stored, message: now.message, details: now.details };
  });
}

/** One read of the list in one snapshot, or null when some item is due and `stale` is not allowed. */
async function readPage(sequelize: Sequelize, query: AnomalyListQuery, now: Date, stale: boolean): Promise<AnomalyPage | null> {
  return sequelize.transaction({ isolationLevel: Transaction.ISOLATION_LEVELS.REPEATABLE_READ }, async (transaction) => {
    const q = <T extends object>(sql: string, bind: unknown[] = []) => sequelize.query<T>(sql, { bind, transaction, type: QueryTypes.SELECT });
    const [check] = await q<{ due: boolean }>(
      `SELECT EXISTS (SELECT 1 FROM ${ITEMS_FROM} LEFT JOIN anomaly_item_state s ON s.item_id = i.id WHERE ${DUE_SQL})
           OR (${STATIONS_SQL}) <> (SELECT stations FROM anomaly_sweep_state) AS due`,
      [now],
    );
    const due = check?.due !== false;
    if (due && !stale) return null;
    const [state] = await q<SweepStateRow>('SELECT event_watermark, stations, swept_at, items_checked FROM anomaly_sweep_state');
    // Nothing due in this snapshot: every stored judgement holds at `now`.
    const checkedAt = due ? (state?.swept_at ?? now) : now;
    const filters: string[] = [];
    const bind: unknown[] = [];
    if (query.severity !== undefined) filters.push(`f.severity = $${bind.push(query.severity)}`);
    if (query.code !== undefined) filters.push(`f.code = $${bind.push(query.code)}`);
    const where = filters.length > 0 ? filters.join(' AND ') : 'true';
    const [totals] = await q<{ info: number; warning: number; critical: number; total: number }>(
      `SELECT count(*) FILTER (WHERE f.severity = 'info')::integer AS info,
              count(*) FILTER (WHERE f.severity = 'warning')::integer AS warning,
              count(*) FILTER (WHERE f.severity = 'critical')::integer AS critical,
              count(*) FILTER (WHERE ${where})::integer AS total
         FROM anomaly_findings f`,
      bind,
    );
    const rows = await q<FindingRow>(
      `SELECT f.item_id, f.ordinal, f.item_code, f.kind, f.state, f.severity, f.code, f.event_seq, f.message, f.details,
              coalesce(s.running, false) AS running
         FROM anomaly_findings f LEFT JOIN anomaly_item_state s ON s.item_id = f.item_id
        WHERE ${where}
        ORDER BY f.severity_rank DESC, f.item_code, f.event_seq, f.ordinal
        LIMIT $${bind.length + 1} OFFSET $${bind.length + 2}`,
      [...bind, query.pageSize, (query.page - 1) * query.pageSize],
    );
    return {
      items: await reword(sequelize, transaction, rows, checkedAt),
      total: totals?.total ?? 0,
      page: query.page,
      pageSize: query.pageSize,
      counts: { info: totals?.info ?? 0, warning: totals?.warning ?? 0, critical: totals?.critical ?? 0 },
      itemsChecked: state?.items_checked ?? 0,
      checkedAt: checkedAt.toISOString(),
    };
  });
}

/**
 * GET /api/anomalies from the stored findings: sweeps first when some item is due (a full sweep
 * when `full`), then reads one page, most serious first (then by item code and event), with
 * counts per severity over the whole lab. The answer is what judging every item afresh at
 * `checkedAt` would give. `now` is for tests.
 */
export async function storedLabAnomalies(
  sequelize: Sequelize,
  query: AnomalyListQuery,
  opts: { full?: boolean; now?: Date } = {},
): Promise<AnomalyPage> {
  if (opts.full === true) await sweepAnomalies(sequelize, { full: true, now: opts.now });
  for (let attempt = 1; ; attempt++) {
    const page = await readPage(sequelize, query, opts.now ?? new Date(), attempt >= READ_ATTEMPTS);
    if (page !== null) return page;
    await sweepAnomalies(sequelize, { now: opts.now });
  }
}
