/**
 * The trace of one item: where it comes from (order → heat → sample → specimen → halves), every
 * event of it and of the pieces it is tied to, each chain checked, its attachments and files
 * checked, and the anomalies found in it. The audit pack and the lab-wide anomaly list reuse the
 * loaders here.
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import {
  ConditioningRuleSchema,
  detectAnomalies,
  placementsOf,
  type ConditioningRule,
  type Placement,
} from '../../shared/domain/anomalies';
import { verifyChain } from '../../shared/domain/ledger/event-hash';
import { describeState, type ItemKind, type ProjectionState } from '../../shared/domain/ledger/state-machine';
import type { StationKind } from '../../shared/schemas/stations';
import type { FileCheck } from '../../shared/schemas/attachments';
import type {
  TraceActor,
  TraceAnomaly,
  TraceAttachment,
  TraceChain,
  TraceEvent,
  TraceGenealogy,
  TraceRole,
  TraceView,
} from '../../shared/schemas/trace';
import type { AppContext } from '../app';
import { notFound } from '../errors';
import { codeFromParam, containerChain } from '../ledger/items';
import { eventFromRow, type EventRow } from '../ledger/rows';
import { EVENT_COLUMNS } from '../ledger/sql';
import type { EventView } from '../ledger/types';
import { checkFiles, readAttachments } from './attachments';

/** One item whose chain belongs to a trace or an audit pack. */
export interface ScopeItem {
  id: number;
  code: string;
  kind: ItemKind;
  role: TraceRole;
  state: string;
}

interface ItemRow {
  id: string;
  code: string;
  kind: ItemKind;
  state: ProjectionState;
  parent_item_id: string | null;
  container_id: string | null;
  half: 'A' | 'B' | null;
  station_code: string | null;
  station_name: string | null;
}

/** The item a code names, with what the trace needs of its row: 422 for a bad check character, 404 for an unknown code. */
export async function resolveItem(sequelize: Sequelize, raw: string): Promise<ItemRow> {
  const parsed = codeFromParam(raw);
  if (parsed.kind === 'badge') throw notFound(`${parsed.code} is a badge, not an item: badges have no chain of custody to trace.`);
  const [row] = await sequelize.query<ItemRow>(
    `SELECT i.id, i.code, i.kind, i.state, i.parent_item_id, i.container_id, i.half, s.code AS station_code, s.name AS station_name
       FROM items i LEFT JOIN stations s ON s.id = i.station_id WHERE i.code = $1`,
    { bind: [parsed.code], type: QueryTypes.SELECT },
  );
  if (!row) throw notFound(`No item has the code ${parsed.code}. Check the label, or register the item first.`);
  return row;
}

const MAX_CONTENTS = 5_000;

/**
 * The items whose chains go with an item: a specimen and its halves; a half and the specimen it
 * came from; a container alone, or with `contents` everything nested in it now.
 */
export async function traceScope(sequelize: Sequelize, row: ItemRow, opts: { contents: boolean }): Promise<ScopeItem[]> {
  const self: ScopeItem = { id: Number(row.id), code: row.code, kind: row.kind, role: 'self', state: row.state };
  const q = <T extends object>(sql: string, bind: unknown[]) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
  type Found = { id: string; code: string; kind: ItemKind; state: string };
  const toScope = (r: Found, role: TraceRole): ScopeItem => ({ id: Number(r.id), code: r.code, kind: r.kind, role, state: r.state });
  if (row.kind === 'half' && row.parent_item_id !== null) {
    const [parent] = await q<Found>('SELECT id, code, kind, state FROM items WHERE id = $1', [row.parent_item_id]);
    return parent ? [toScope(parent, 'specimen'), self] : [self];
  }
  if (row.kind === 'specimen') {
    const halves = await q<Found>(`SELECT id, code, kind, state FROM items WHERE parent_item_id = $1 AND kind = 'half' ORDER BY half, id`, [row.id]);
    return [self, ...halves.map((h) => toScope(h, 'half'))];
  }
  if (row.kind === 'container' && opts.contents) {
    const inside = await q<Found>(
      `WITH RECURSIVE down(id, depth) AS (
         SELECT id, 1 FROM items WHERE container_id = $1
         UNION ALL SELECT i.id, down.depth + 1 FROM items i JOIN down ON i.container_id = down.id WHERE down.depth < 32)
       SELECT i.id, i.code, i.kind, i.state FROM down JOIN items i ON i.id = down.id ORDER BY i.id LIMIT $2`,
      [row.id, MAX_CONTENTS],
    );
    return [self, ...inside.map((r) => toScope(r, 'content'))];
  }
  return [self];
}

/** The events of some items, each item's in seq order, items in the order given; inside `transaction` when given. */
export async function loadEvents(
  sequelize: Sequelize,
  items: readonly ScopeItem[],
  transaction?: Transaction,
): Promise<Map<string, EventView[]>> {
  const byItem = new Map<string, EventView[]>(items.map((i) => [i.code, []]));
  if (items.length === 0) return byItem;
  const rows = await sequelize.query<EventRow>(
    `SELECT ${EVENT_COLUMNS} FROM custody_events e WHERE e.item_id = ANY($1::bigint[]) ORDER BY e.item_id, e.seq, e.id`,
    { bind: [items.map((i) => i.id)], type: QueryTypes.SELECT, transaction },
  );
  for (const row of rows) byItem.get(row.item_code)?.push(eventFromRow(row));
  return byItem;
}

/** What anomaly detection needs beyond the events: station kinds and each specimen's conditioning rule. */
export interface AnomalySetting {
  stationKinds: Record<string, StationKind>;
  conditioning: Map<number, { rule: ConditioningRule; thicknessMm: number | null }>;
}

/** Loads station kinds and the conditioning rules of the orders some specimens belong to; inside `transaction` when given. */
export async function loadAnomalySetting(
  sequelize: Sequelize,
  specimenIds: readonly number[],
  transaction?: Transaction,
): Promise<AnomalySetting> {
  const stations = await sequelize.query<{ code: string; kind: StationKind }>('SELECT code, kind FROM stations', {
    type: QueryTypes.SELECT,
    transaction,
  });
  const conditioning = new Map<number, { rule: ConditioningRule; thicknessMm: number | null }>();
  if (specimenIds.length > 0) {
    const rows = await sequelize.query<{ item_id: string; conditioning: unknown; thickness_mm: string | null }>(
      `SELECT s.item_id, o.conditioning, sa.thickness_mm FROM specimens s
         JOIN samples sa ON sa.id = s.sample_id JOIN orders o ON o.id = sa.order_id
        WHERE s.item_id = ANY($1::bigint[]) AND o.conditioning IS NOT NULL`,
      { bind: [specimenIds], type: QueryTypes.SELECT, transaction },
    );
    for (const row of rows) {
      const rule = ConditioningRuleSchema.safeParse(row.conditioning);
      // An order whose stored rule does not parse has no rule to judge against.
      if (rule.success) conditioning.set(Number(row.item_id), { rule: rule.data, thicknessMm: row.thickness_mm === null ? null : Number(row.thickness_mm) });
    }
  }
  return { stationKinds: Object.fromEntries(stations.map((s) => [s.code, s.kind])), conditioning };
}

/** Placements of every half, for the check that one piece is not claimed twice or in two places. */
export function halfPlacements(items: readonly ScopeItem[], events: ReadonlyMap<string, readonly EventView[]>): Placement[] {
  return items.filter((i) => i.kind === 'half').flatMap((i) => placementsOf('half', i.code, events.get(i.code) ?? []));
}

/** Anomalies of some items, most serious first within each item. */
export function anomaliesOf(
  items: readonly ScopeItem[],
  events: ReadonlyMap<string, readonly EventView[]>,
  setting: AnomalySetting,
  otherPlacements: readonly Placement[],
  now: Date,
): TraceAnomaly[] {
  return items.flatMap((item) => {
    const own = events.get(item.code) ?? [];
    const conditioning = item.kind === 'specimen' ? setting.conditioning.get(item.id) : undefined;
    return detectAnomalies({
      item: item.code,
      kind: item.kind,
      events: own,
      now,
      chain: verifyChain(own),
      stationKinds: setting.stationKinds,
      conditioning: conditioning ?? null,
      otherPlacements: otherPlacements.filter((p) => p.item !== item.code),
    }).map((a) => ({ ...a, item: item.code }));
  });
}

/** Each item's chain, verified on its own. */
export function chainsOf(items: readonly ScopeItem[], events: ReadonlyMap<string, readonly EventView[]>): TraceChain[] {
  return items.map((item) => {
    const own = events.get(item.code) ?? [];
    const result = verifyChain(own);
    const head = own.at(-1);
    return {
      item: item.code,
      kind: item.kind,
      role: item.role,
      ok: result.ok,
      events: own.length,
      headSeq: head?.seq ?? 0,
      headHash: head?.hash ?? null,
      firstBreak: result.ok ? null : result.firstBreak,
    };
  });
}

/** Order, heat, sample, specimen and halves of a specimen or half; containers around the item; a container's contents. */
export async function loadGenealogy(sequelize: Sequelize, row: ItemRow): Promise<TraceGenealogy> {
  const q = <T extends object>(sql: string, bind: unknown[]) => sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
  const genealogy: TraceGenealogy = {
    customer: null,
    order: null,
    heat: null,
    sample: null,
    specimen: null,
    halves: [],
    containers: await containerChain(sequelize, row.container_id === null ? null : Number(row.container_id)),
    contents: [],
  };
  const specimenId = row.kind === 'specimen' ? row.id : row.kind === 'half' ? row.parent_item_id : null;
  if (specimenId !== null) {
    const [g] = await q<{
      code: string; state: string; geometry_key: string; test_standard: string;
      sample_id: number; sample_code: string; position: string; orientation: string; thickness_mm: string | null;
      order_id: number; order_number: string; po_reference: string; material_spec: string; order_standard: string;
      customer_id: number; customer_name: string;
      heat_id: number; heat_number: string; material: string; grade: string; producer: string; certificate_ref: string | null;
    }>(
      `SELECT i.code, i.state, s.geometry_key, s.test_standard,
              sa.id AS sample_id, sa.code AS sample_code, sa.position, sa.orientation, sa.thickness_mm::text AS thickness_mm,
              o.id AS order_id, o.number AS order_number, o.po_reference, o.material_spec, o.test_standard AS order_standard,
              c.id AS customer_id, c.name AS customer_name,
              h.id AS heat_id, h.heat_number, h.material, h.grade, h.producer, h.certificate_ref
         FROM items i JOIN specimens s ON s.item_id = i.id JOIN samples sa ON sa.id = s.sample_id
         JOIN orders o ON o.id = sa.order_id JOIN customers c ON c.id = o.customer_id JOIN heats h ON h.id = sa.heat_id
        WHERE i.id = $1`,
      [specimenId],
    );
    if (g) {
      genealogy.customer = { id: g.customer_id, name: g.customer_name };
      genealogy.order = { id: g.order_id, number: g.order_number, poReference: g.po_reference, materialSpec: g.material_spec, testStandard: g.order_standard };
      genealogy.heat = { id: g.heat_id, heatNumber: g.heat_number, material: g.material, grade: g.grade, producer: g.producer, certificateRef: g.certificate_ref };
      genealogy.sample = { id: g.sample_id, code: g.sample_code, position: g.position, orientation: g.orientation, thicknessMm: g.thickness_mm };
      genealogy.specimen = { code: g.code, state: g.state, geometryKey: g.geometry_key, testStandard: g.test_standard };
    }
    genealogy.halves = await q<{ code: string; side: 'A' | 'B'; state: string }>(
      `SELECT code, half AS side, state FROM items WHERE parent_item_id = $1 AND kind = 'half' ORDER BY half, id`,
      [specimenId],
    );
  }
  if (row.kind === 'container') {
    genealogy.contents = await q<{ code: string; kind: string; state: string }>(
      'SELECT code, kind, state FROM items WHERE container_id = $1 ORDER BY kind, code LIMIT 500',
      [row.id],
    );
  }
  return genealogy;
}

/** Names of the people and instruments behind some events, and of their signers. */
async function actorNames(sequelize: Sequelize, events: readonly EventView[]) {
  const userIds = new Set<number>();
  const tokenIds = new Set<number>();
  for (const e of events) {
    if (e.actor.kind === 'user') userIds.add(e.actor.id);
    else tokenIds.add(e.actor.id);
    if (e.signature) userIds.add(e.signature.signer);
  }
  const users = userIds.size
    ? await sequelize.query<{ id: number; name: string; role: string }>('SELECT id, name, role FROM users WHERE id = ANY($1::int[])', {
        bind: [[...userIds]],
        type: QueryTypes.SELECT,
      })
    : [];
  const tokens = tokenIds.size
    ? await sequelize.query<{ id: number; name: string; station: string }>(
        'SELECT t.id, t.name, s.code AS station FROM instrument_tokens t JOIN stations s ON s.id = t.station_id WHERE t.id = ANY($1::int[])',
        { bind: [[...tokenIds]], type: QueryTypes.SELECT },
      )
    : [];
  return { users: new Map(users.map((u) => [u.id, u])), tokens: new Map(tokens.map((t) => [t.id, t])) };
}

/** The timeline: every event of the scope, by the server's time (then item and seq), with names. */
export async function timelineOf(
  sequelize: Sequelize,
  events: ReadonlyMap<string, readonly EventView[]>,
): Promise<TraceEvent[]> {
  const all = [...events.values()].flat();
  const { users, tokens } = await actorNames(sequelize, all);
  const stations = await sequelize.query<{ code: string; name: string }>('SELECT code, name FROM stations', { type: QueryTypes.SELECT });
  const stationNames = new Map(stations.map((s) => [s.code, s.name]));
  const cancelled = new Set(all.flatMap((e) => (e.type === 'voided' && e.corrects !== null ? [e.corrects] : [])));
  const actorOf = (e: EventView): TraceActor => {
    if (e.actor.kind === 'user') {
      const u = users.get(e.actor.id);
      return { kind: 'user', id: e.actor.id, name: u?.name ?? `user ${e.actor.id}`, role: u?.role ?? null };
    }
    const t = tokens.get(e.actor.id);
    return { kind: 'instrument', id: e.actor.id, name: t?.name ?? `instrument ${e.actor.id}`, role: t ? `instrument at ${t.station}` : null };
  };
  return all
    .map((e) => ({
      item: e.item,
      seq: e.seq,
      type: e.type,
      actor: actorOf(e),
      station: e.station,
      stationName: e.station === null ? null : (stationNames.get(e.station) ?? null),
      container: e.container,
      occurredAt: e.occurredAt,
      recordedAt: e.recordedAt,
      payload: e.payload as Record<string, unknown>,
      signature: e.signature
        ? { ...e.signature, signerName: users.get(e.signature.signer)?.name ?? `user ${e.signature.signer}` }
        : null,
      corrects: e.corrects,
      cancelled: cancelled.has(e.hash),
      hash: e.hash,
      prevHash: e.prevHash,
    }))
    .sort((a, b) => (a.recordedAt < b.recordedAt ? -1 : a.recordedAt > b.recordedAt ? 1 : a.item < b.item ? -1 : a.item > b.item ? 1 : a.seq - b.seq));
}

/** The attachments the scope's `attached` events cite, and the check of their stored files. */
export async function attachmentsOf(
  ctx: AppContext,
  events: ReadonlyMap<string, readonly EventView[]>,
  mode: 'presence' | 'rehash',
): Promise<{ attachments: TraceAttachment[]; files: TraceView['files'] }> {
  const attachedEvents = [...events.values()].flat().filter((e) => e.type === 'attached' && typeof e.payload.sha256 === 'string');
  const views = await readAttachments(ctx.sequelize, attachedEvents.map((e) => String(e.payload.sha256)));
  const byHash = new Map(views.map((v) => [v.sha256, v]));
  const attachments: TraceAttachment[] = attachedEvents.flatMap((e) => {
    const view = byHash.get(String(e.payload.sha256));
    const note = typeof e.payload.note === 'string' ? e.payload.note : null;
    return view ? [{ ...view, item: e.item, seq: e.seq, occurredAt: e.occurredAt, note }] : [];
  });
  const elsewhere = attachedEvents.filter((e) => !byHash.has(String(e.payload.sha256)));
  // Signed test reports are cited by attached events too, but kept with their PDF in test_reports.
  const reports = elsewhere.length
    ? await ctx.sequelize.query<{ number: string; sha256: string; actual: string }>(
        `SELECT number, pdf_sha256 AS sha256, encode(sha256(pdf), 'hex') AS actual FROM test_reports WHERE pdf_sha256 = ANY($1::text[])`,
        { bind: [elsewhere.map((e) => String(e.payload.sha256))], type: QueryTypes.SELECT },
      )
    : [];
  const reportChecks: FileCheck[] = reports.map((r) => ({
    sha256: r.sha256,
    ok: r.actual === r.sha256,
    problem: r.actual === r.sha256 ? null : ('changed' as const),
    actual: r.actual,
    message: r.actual === r.sha256 ? `Test report ${r.number}: its PDF re-hashed, matches.` : `Test report ${r.number}: its stored PDF no longer hashes to the cited SHA-256.`,
  }));
  const reported = new Set(reports.map((r) => r.sha256));
  const unknown: FileCheck[] = elsewhere
    .filter((e) => !reported.has(String(e.payload.sha256)))
    .map((e) => ({
      sha256: String(e.payload.sha256),
      ok: false,
      problem: 'missing' as const,
      actual: null,
      message: `${e.item} seq ${e.seq} cites a file that was never stored.`,
    }));
  let checks: FileCheck[];
  if (views.length === 0) checks = [];
  else if (ctx.storage === null) {
    checks = views.map((v) => ({ sha256: v.sha256, ok: false, problem: 'missing' as const, actual: null, message: 'No object storage is configured, so the file cannot be read.' }));
  } else checks = await checkFiles(ctx, views.map((v) => ({ sha256: v.sha256, size: v.size })), mode);
  const all = [...checks, ...reportChecks, ...unknown];
  return { attachments, files: { mode, ok: all.every((c) => c.ok), checks: all } };
}

/**
 * GET /api/items/:code/trace: genealogy, location, timeline, chains, files, anomalies. Files are
 * checked for presence and size, or read and re-hashed in full when `files` is `rehash`.
 */
export async function buildTrace(ctx: AppContext, code: string, opts: { files: 'presence' | 'rehash'; canExport: boolean }): Promise<TraceView> {
  const { sequelize } = ctx;
  const row = await resolveItem(sequelize, code);
  const scope = await traceScope(sequelize, row, { contents: false });
  const events = await loadEvents(sequelize, scope);
  const setting = await loadAnomalySetting(sequelize, scope.filter((s) => s.kind === 'specimen').map((s) => s.id));
  const now = new Date();
  const [genealogy, timeline, files] = await Promise.all([
    loadGenealogy(sequelize, row),
    timelineOf(sequelize, events),
    attachmentsOf(ctx, events, opts.files),
  ]);
  const chains = chainsOf(scope, events);
  const anomalies = anomaliesOf(scope, events, setting, halfPlacements(scope, events), now);
  return {
    item: { code: row.code, kind: row.kind, state: row.state, stateLabel: describeState(row.state) },
    location: {
      station: row.station_code === null ? null : { code: row.station_code, name: row.station_name ?? row.station_code },
      text: genealogy.containers.map((c) => `${c.name} (${c.code})`).join(' › ') || (row.station_code ?? 'no container'),
    },
    genealogy,
    events: timeline,
    chains,
    chainOk: chains.every((c) => c.ok),
    files: files.files,
    attachments: files.attachments,
    anomalies,
    verifiedAt: now.toISOString(),
    canExport: opts.canExport,
  };
}
