/**
 * The ledger's unit of work: judges a list of custody events in order against the items'
 * projections, appends the accepted ones to their chains and updates the projections, all in
 * one transaction. A single scan is a unit of one; a batch is a unit of many, judged one by one.
 */
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { halfCode, parseCode } from '../../shared/domain/codes';
import {
  computeEventHash,
  EVENT_FORMAT_VERSION,
  EventFormatError,
  GENESIS_HASH,
  type HashedEvent,
} from '../../shared/domain/ledger/event-hash';
import {
  allowedNext,
  applyEvent,
  describeState,
  emptyProjection,
  type ApplyRefusal,
  type ItemKind,
  type Projection,
} from '../../shared/domain/ledger/state-machine';
import { can } from '../../shared/permissions';
import type { ParsedEventInput } from '../../shared/schemas/events';
import type { AreaPolicy } from '../../shared/domain/measurement';
import { containerProblem, type ContainerType } from './container-rules';
import { areaPolicyOf, completeMeasuredPayload } from './measured';
import { eventFromRow, type EventRow } from './rows';
import type pg from 'pg';
import {
  closingMessage,
  EVENTS_BY_KEYS_SQL,
  IDEMPOTENCY_KEY_CONSTRAINT,
  INSERT_REFUSALS_SQL,
  LOCK_ITEMS_SQL,
  openingMessage,
  WRITE_EVENTS_SQL,
} from './sql';
import { conflict } from '../errors';
import type { EventOutcome, EventView, ItemSummary, RecordOptions, RefusedEvent } from './types';

/** Thrown inside a unit when it must be rolled back and judged again with the idempotency keys looked up first. */
export class RetryUnit extends Error {
  constructor(reason: string) {
    super(reason);
    this.name = 'RetryUnit';
  }
}

interface WorkItem {
  id: number;
  code: string;
  kind: ItemKind;
  projection: Projection;
  parentItemId: number | null;
  half: 'A' | 'B' | null;
  geometryKey: string | null;
  areaPolicy: AreaPolicy;
  dirty: boolean;
  lastEventAt: string | null;
}

interface RefContainer {
  id: number;
  code: string;
  kind: ItemKind;
  state: string;
  containerType: ContainerType | null;
  binHalf: 'A' | 'B' | null;
}

interface LockRow {
  id: string | number;
  code: string;
  kind: ItemKind;
  state: string;
  projection: Projection | Record<string, never>;
  last_seq: number;
  head_hash: string | null;
  parent_item_id: string | number | null;
  half: 'A' | 'B' | null;
  geometry_key: string | null;
  area_policy: string | null;
  stations: { id: number; code: string; active: boolean }[] | null;
  refs: { id: string | number; code: string; kind: ItemKind; state: string; containerType: ContainerType | null; binHalf: 'A' | 'B' | null }[] | null;
}

/** An event that passed the checks that need no database, ready to be judged in a unit. */
export interface PreparedEvent {
  input: ParsedEventInput;
  itemCode: string;
  containerCode: string | null;
  stationUpper: string | null;
}

/** A refusal in the API's shape. */
export function refused(status: RefusedEvent['status'], code: string, message: string, details?: unknown): RefusedEvent {
  return details === undefined ? { status, error: { code, message } } : { status, error: { code, message, details } };
}

/**
 * Checks an event against everything that needs no database: its codes' check characters, the
 * actor's right to post its type (and an instrument token's station), and that registration
 * events come only from the server's own registration paths.
 */
export function prepareEvent(input: ParsedEventInput, opts: RecordOptions): PreparedEvent | RefusedEvent {
  const item = parseCode(input.itemCode);
  if (!item.ok) return refused(422, 'invalid', item.message, [{ path: 'itemCode', message: item.message }]);
  if (item.kind === 'badge') {
    return refused(422, 'invalid', `${item.code} is a badge, not an item with a chain of custody.`, [
      { path: 'itemCode', message: 'is a badge code' },
    ]);
  }
  let containerCode: string | null = null;
  if (input.containerCode) {
    const container = parseCode(input.containerCode);
    if (!container.ok) return refused(422, 'invalid', container.message, [{ path: 'containerCode', message: container.message }]);
    if (container.kind !== 'container') {
      const message = `${container.code} is a ${container.kind} code; scan a container (bin, bag, box, shelf or cart).`;
      return refused(422, 'invalid', message, [{ path: 'containerCode', message }]);
    }
    containerCode = container.code;
  }
  const type = input.type;
  if (!opts.allowRegistration && (type === 'registered' || type === 'split_from')) {
    const message =
      type === 'registered'
        ? 'Items are registered by the cut list (specimens) or POST /api/containers (containers), not by a scan.'
        : 'split_from is recorded by the server when a specimen is tested and fractures.';
    return refused(422, 'registration_elsewhere', message, [{ path: 'type', message }]);
  }
  const actor = opts.actor;
  let stationUpper = input.stationCode ? input.stationCode.toUpperCase() : null;
  if (actor.kind === 'instrument') {
    if (type === 'voided') return refused(403, 'forbidden', 'Instrument tokens may not void events; a lab manager signs voids.');
    if (!actor.eventTypes.includes(type)) {
      return refused(403, 'token_type', `This instrument token may post ${actor.eventTypes.join(', ') || 'no event types'}, not ${type}.`, {
        allowed: actor.eventTypes,
      });
    }
    if (stationUpper !== null && stationUpper !== actor.stationCode.toUpperCase()) {
      return refused(403, 'token_station', `This instrument token belongs to station ${actor.stationCode}, not ${input.stationCode}.`, {
        station: actor.stationCode,
      });
    }
    stationUpper = actor.stationCode.toUpperCase();
  } else {
    if (!can(actor.role, 'events.record')) return refused(403, 'forbidden', `Your role (${actor.role}) may not record events.`);
    if (type === 'voided' && !can(actor.role, 'events.void')) {
      return refused(403, 'forbidden', `Your role (${actor.role}) may not void events; ask a lab manager.`, { action: 'events.void' });
    }
    if ((type === 'disposed' || type === 'returned') && !can(actor.role, 'disposals.write')) {
      return refused(403, 'forbidden', `Your role (${actor.role}) may not dispose of or return items.`, { action: 'disposals.write' });
    }
  }
  return { input, itemCode: item.code, containerCode, stationUpper };
}

function isRefused(value: PreparedEvent | RefusedEvent): value is RefusedEvent {
  return 'status' in value;
}

function fromRefusal(refusal: ApplyRefusal): RefusedEvent {
  switch (refusal.code) {
    case 'state_refused':
      return refused(409, 'state_refused', refusal.message, { state: refusal.state, allowed: refusal.allowed, message: refusal.message });
    case 'event_invalid':
      return refused(422, 'invalid', refusal.message, refusal.issues);
    case 'void_refused':
      return refused(409, 'void_refused', refusal.message, { expected: refusal.expected, actual: refusal.actual });
    case 'chain_refused':
      return refused(409, 'chain_refused', refusal.message, { expected: refusal.expected, actual: refusal.actual });
  }
}

function summary(item: WorkItem): ItemSummary {
  const p = item.projection;
  return { code: item.code, kind: item.kind, state: p.state, allowed: allowedNext(item.kind, p.state), container: p.container, station: p.station };
}

function halvesOf(event: EventView): string[] {
  if (event.type !== 'tested' || event.payload.fractured !== true) return [];
  const parsed = parseCode(event.item);
  return parsed.ok && parsed.kind === 'specimen' ? [halfCode(event.item, 'A'), halfCode(event.item, 'B')] : [];
}

function projectionOf(row: { code: string; kind: ItemKind; last_seq: number; projection: Projection | Record<string, never> }): Projection {
  const stored = row.projection;
  if (row.last_seq === 0 || !('state' in stored)) return emptyProjection(row.kind, row.code);
  return stored as Projection;
}

function workItem(row: LockRow): WorkItem {
  return {
    id: Number(row.id),
    code: row.code,
    kind: row.kind,
    projection: projectionOf(row),
    parentItemId: row.parent_item_id === null ? null : Number(row.parent_item_id),
    half: row.half,
    geometryKey: row.geometry_key,
    areaPolicy: areaPolicyOf(row.area_policy),
    dirty: false,
    lastEventAt: null,
  };
}

const ITEM_SELECT = `SELECT i.id, i.code, i.kind, i.state, i.projection, i.last_seq, i.head_hash, i.parent_item_id, i.half,
  NULL::text AS geometry_key, NULL::text AS area_policy, NULL::json AS stations, NULL::json AS refs FROM items i`;

type WriteRow = { inserted: { id: number; key: string }[]; updated: number };
type LockParams = [string[], string[], string[]];
type WriteParams = [string, string, number];

/**
 * How a unit reaches the database. `open` sends the unit's first reads (the lock, and the
 * stored idempotency keys when asked); `close` its last write (or none). A unit in a caller's
 * transaction sends them as ordinary statements and the caller commits; a unit in its own
 * transaction sends BEGIN with the first and COMMIT with the last (see PipelinedDb).
 */
interface UnitDb {
  query<T extends object>(sql: string, bind: unknown[]): Promise<T[]>;
  open(lock: LockParams, keys: string[] | null): Promise<{ rows: LockRow[]; stored: EventRow[] }>;
  close(write: WriteParams | null): Promise<WriteRow | null>;
}

/** A unit inside a Sequelize transaction that its caller commits. */
class TransactionDb implements UnitDb {
  constructor(
    private readonly sequelize: Sequelize,
    private readonly transaction: Transaction,
  ) {}

  query<T extends object>(sql: string, bind: unknown[]): Promise<T[]> {
    return this.sequelize.query<T>(sql, { bind, transaction: this.transaction, type: QueryTypes.SELECT });
  }

  async open(lock: LockParams, keys: string[] | null): Promise<{ rows: LockRow[]; stored: EventRow[] }> {
    const rows = await this.query<LockRow>(LOCK_ITEMS_SQL, lock);
    const stored = keys === null ? [] : await this.query<EventRow>(EVENTS_BY_KEYS_SQL, [keys]);
    return { rows, stored };
  }

  async close(write: WriteParams | null): Promise<WriteRow | null> {
    if (write === null) return null;
    const [row] = await this.query<WriteRow>(WRITE_EVENTS_SQL, write);
    return row ?? null;
  }
}

/**
 * A unit in a transaction of its own on one pooled connection, with BEGIN sent in the same
 * message as the lock and COMMIT in the same message as the write (the simple query protocol
 * takes several statements at once): two round trips for a scan instead of four. A failing
 * statement skips the rest of its message, so a failed write is never committed; the caller
 * then calls rollback().
 */
class PipelinedDb implements UnitDb {
  private state: 'idle' | 'open' | 'done' = 'idle';

  constructor(private readonly client: pg.ClientBase) {}

  async query<T extends object>(sql: string, bind: unknown[]): Promise<T[]> {
    if (this.state !== 'open') throw new Error('a ledger statement outside its transaction');
    return (await this.client.query(sql, bind)).rows as T[];
  }

  async open(lock: LockParams, keys: string[] | null): Promise<{ rows: LockRow[]; stored: EventRow[] }> {
    this.state = 'open';
    const results = (await this.client.query(openingMessage(lock, keys))) as unknown as pg.QueryResult[];
    return { rows: (results[1]?.rows ?? []) as LockRow[], stored: (results[2]?.rows ?? []) as EventRow[] };
  }

  async close(write: WriteParams | null): Promise<WriteRow | null> {
    if (this.state !== 'open') return null;
    const result = await this.client.query(closingMessage(write));
    this.state = 'done';
    if (write === null) return null;
    const results = result as unknown as pg.QueryResult[];
    return (results[0]?.rows[0] as WriteRow | undefined) ?? null;
  }

  /** Ends an open transaction without keeping anything. */
  async rollback(): Promise<void> {
    if (this.state !== 'open') return;
    this.state = 'done';
    await this.client.query('ROLLBACK');
  }
}

/** True for the unique violation a second event with a used idempotency key causes. */
function isKeyTaken(error: unknown): boolean {
  const e = error as { code?: string; constraint?: string; parent?: { code?: string; constraint?: string } };
  const pgError = e?.parent ?? e;
  return pgError?.code === '23505' && pgError.constraint === IDEMPOTENCY_KEY_CONSTRAINT;
}

/** Everything one unit of work reads and writes, in one transaction. */
class Unit {
  private readonly items = new Map<string, WorkItem>();
  private readonly stations = new Map<string, { id: number; code: string; active: boolean }>();
  private readonly refs = new Map<string, RefContainer>();
  private readonly stored = new Map<string, EventView>();
  private readonly recorded = new Map<string, EventView>();
  private pending: { itemId: number; view: EventView }[] = [];
  private readonly maxSkewMs: number;

  constructor(
    private readonly db: UnitDb,
    private readonly opts: RecordOptions,
    private readonly precheck: boolean,
    maxSkewHours: number,
  ) {
    this.maxSkewMs = maxSkewHours * 3_600_000;
  }

  private query<T extends object>(sql: string, bind: unknown[]): Promise<T[]> {
    return this.db.query<T>(sql, bind);
  }

  /** Judges every event in order and writes the accepted ones; returns one outcome per event. */
  async run(events: readonly (PreparedEvent | RefusedEvent)[]): Promise<EventOutcome[]> {
    const prepared = events.filter((e): e is PreparedEvent => !isRefused(e));
    if (prepared.length > 0) await this.load(prepared);
    const outcomes: EventOutcome[] = [];
    for (const event of events) {
      if (isRefused(event)) {
        outcomes.push(event);
        continue;
      }
      const outcome = await this.judge(event);
      // Without the keys looked up first, a refusal may really be a retry of a recorded event.
      if (!this.precheck && !('event' in outcome)) throw new RetryUnit('refused without idempotency precheck');
      outcomes.push(outcome);
    }
    await this.flush(true);
    return outcomes;
  }

  private async load(prepared: readonly PreparedEvent[]): Promise<void> {
    const codes = [...new Set(prepared.map((p) => p.itemCode))];
    const stationCodes = [...new Set(prepared.flatMap((p) => (p.stationUpper === null ? [] : [p.stationUpper])))];
    const containerCodes = [...new Set(prepared.flatMap((p) => (p.containerCode === null ? [] : [p.containerCode])))];
    const keys = this.precheck ? [...new Set(prepared.map((p) => p.input.idempotencyKey))] : null;
    const { rows, stored } = await this.db.open([codes, stationCodes, containerCodes], keys);
    for (const row of rows) this.items.set(row.code, workItem(row));
    const first = rows[0];
    for (const station of first?.stations ?? []) this.stations.set(station.code.toUpperCase(), station);
    for (const ref of first?.refs ?? []) this.refs.set(ref.code, { ...ref, id: Number(ref.id) });
    for (const row of stored) this.stored.set(row.idempotency_key, eventFromRow(row));
  }

  private replay(p: PreparedEvent, event: EventView): EventOutcome {
    if (event.item !== p.itemCode || event.type !== p.input.type) {
      return refused(
        409,
        'idempotency_conflict',
        `The idempotency key ${p.input.idempotencyKey} was already used for ${event.type} on ${event.item}; make a new key for each scan.`,
        { event },
      );
    }
    const item = this.items.get(event.item);
    const flags = Array.isArray(event.payload.outOfTolerance) ? ['out_of_tolerance'] : [];
    const itemSummary: ItemSummary = item
      ? summary(item)
      : { code: event.item, kind: 'specimen', state: 'none', allowed: [], container: null, station: null };
    return { status: 200, replayed: true, event, item: itemSummary, halves: halvesOf(event), flags };
  }

  private async judge(p: PreparedEvent): Promise<EventOutcome> {
    const { input } = p;
    const key = input.idempotencyKey;
    const seen = this.recorded.get(key) ?? this.stored.get(key);
    if (seen) return this.replay(p, seen);

    const now = Date.now();
    const skew = Math.abs(Date.parse(input.occurredAt) - now);
    if (skew > this.maxSkewMs) {
      const hours = (skew / 3_600_000).toFixed(1);
      return refused(
        422,
        'clock_skew',
        `The device's clock reads ${input.occurredAt} but the server's reads ${new Date(now).toISOString()}: ${hours} h apart, more than the ${this.maxSkewMs / 3_600_000} h allowed. Set the device's date and time, then scan again.`,
        [{ path: 'occurredAt', message: `is ${hours} h from the server's time` }],
      );
    }

    const item = this.items.get(p.itemCode);
    if (!item) return refused(404, 'not_found', `No item has the code ${p.itemCode}. Check the label, or register the item first.`);

    let station: string | null = null;
    if (p.stationUpper !== null) {
      const found = this.stations.get(p.stationUpper);
      if (!found) return refused(422, 'unknown_station', `No station has the code ${input.stationCode}.`, [{ path: 'stationCode', message: 'is not a station' }]);
      if (!found.active) return refused(422, 'station_inactive', `Station ${found.code} is inactive.`, [{ path: 'stationCode', message: 'is inactive' }]);
      station = found.code;
    }

    const type = input.type;
    let corrects: string | null = null;
    if (type === 'voided') {
      if (!this.opts.signature) {
        return refused(422, 'signature_required', 'A void needs a signature: sign with your password, then send the signature token.', [
          { path: 'signatureToken', message: 'is required for a void' },
        ]);
      }
      corrects = input.corrects ?? item.projection.effective.at(-1)?.hash ?? null;
    }

    const body: HashedEvent = {
      v: EVENT_FORMAT_VERSION,
      item: item.code,
      seq: item.projection.lastSeq + 1,
      type,
      actor: { kind: this.opts.actor.kind, id: this.opts.actor.id },
      station,
      container: p.containerCode,
      occurredAt: input.occurredAt,
      recordedAt: new Date(now).toISOString(),
      payload: input.payload as HashedEvent['payload'],
      idempotencyKey: key,
      corrects,
      // Voids must carry one; other signed actions (disposal, return, override) may.
      signature: this.opts.signature ?? null,
      prevHash: item.projection.headHash,
    };
    // The state machine speaks first: a scan that does not fit answers 409 whatever its payload.
    const probe = applyEvent(item.projection, { ...body, hash: GENESIS_HASH });
    if (!probe.ok) return fromRefusal(probe);

    const containerRefusal = p.containerCode === null ? null : await this.checkContainer(item, type, p.containerCode);
    if (containerRefusal) return containerRefusal;
    if (type === 'disposed' && item.kind === 'container') {
      const [row] = await this.query<{ n: number }>('SELECT count(*)::integer AS n FROM items WHERE container_id = $1', [item.id]);
      if ((row?.n ?? 0) > 0) {
        return refused(409, 'container_not_empty', `${item.code} still holds ${row?.n} item(s); move them out before disposing of it.`);
      }
    }
    if (type === 'voided') {
      const voidRefusal = await this.checkVoid(item, corrects);
      if (voidRefusal) return voidRefusal;
    }

    let flags: string[] = [];
    if (type === 'measured') {
      const measured = completeMeasuredPayload(item.code, item.geometryKey, item.areaPolicy, input.payload);
      if (!measured.ok) return refused(measured.status, measured.error.code, measured.error.message, measured.error.details);
      body.payload = measured.payload as HashedEvent['payload'];
      flags = measured.flags;
    }

    let hash: string;
    try {
      hash = computeEventHash(body);
    } catch (error) {
      if (error instanceof EventFormatError) {
        return refused(422, 'invalid', error.message, error.issues.map((issue) => ({ path: issue.split(':')[0], message: issue })));
      }
      throw error;
    }
    const result = applyEvent(item.projection, { ...body, hash });
    if (!result.ok) return fromRefusal(result);
    const view: EventView = { id: 0, ...body, hash };
    this.accept(item, result.projection, view);

    const halves = result.halves ? await this.split(item, view) : [];
    return { status: 201, replayed: false, event: view, item: summary(item), halves, flags };
  }

  private accept(item: WorkItem, projection: Projection, view: EventView): void {
    item.projection = projection;
    item.dirty = true;
    item.lastEventAt = view.recordedAt;
    this.pending.push({ itemId: item.id, view });
    this.recorded.set(view.idempotencyKey, view);
  }

  private async checkContainer(item: WorkItem, type: ParsedEventInput['type'], code: string): Promise<RefusedEvent | null> {
    if (code === item.code) return refused(422, 'container_cycle', `${code} cannot be put inside itself.`);
    const ref = this.refs.get(code);
    if (!ref) return refused(422, 'unknown_container', `No container has the code ${code}. Register it first.`, [{ path: 'containerCode', message: 'is not registered' }]);
    // A container changed earlier in this unit is judged by its state now, not as loaded.
    const state = this.items.get(code)?.projection.state ?? ref.state;
    if (state !== 'active') {
      return refused(409, 'container_unavailable', `${code} is ${describeState(state as Projection['state'])}; items cannot go into it.`, { container: code, state });
    }
    if (ref.containerType === null) return refused(422, 'unknown_container', `${code} has no container record.`);
    const problem = containerProblem(type, { kind: item.kind, half: item.half }, { code, containerType: ref.containerType, binHalf: ref.binHalf });
    if (problem) return refused(422, 'container_mismatch', problem, [{ path: 'containerCode', message: problem }]);
    if (item.kind === 'container' && (type === 'moved' || type === 'registered')) {
      // Nesting must stay a tree: the new outer container may not sit inside this one.
      const [row] = await this.query<{ inside: boolean }>(
        `WITH RECURSIVE up(id, container_id, depth) AS (
           SELECT id, container_id, 0 FROM items WHERE id = $1
           UNION ALL SELECT i.id, i.container_id, up.depth + 1 FROM items i JOIN up ON i.id = up.container_id WHERE up.depth < 64)
         SELECT EXISTS (SELECT 1 FROM up WHERE id = $2) AS inside`,
        [ref.id, item.id],
      );
      if (row?.inside) return refused(422, 'container_cycle', `${code} is inside ${item.code}; a container cannot go into what it holds.`);
    }
    return null;
  }

  private async checkVoid(item: WorkItem, corrects: string | null): Promise<RefusedEvent | null> {
    const target = item.projection.effective.at(-1);
    if (!target || target.hash !== corrects) return null; // applyEvent names the right target
    if (target.type === 'tested' && item.projection.state === 'broken') {
      const halves = await this.query<{ code: string; state: string }>(
        `SELECT code, state FROM items WHERE parent_item_id = $1 AND kind = 'half' AND state <> 'none' ORDER BY half`,
        [item.id],
      );
      const live = halves.filter((h) => this.items.get(h.code)?.projection.state !== 'none');
      if (live.length > 0) {
        return refused(409, 'void_refused', `${item.code} fractured into ${live.map((h) => h.code).join(' and ')}; void their split_from events first.`, {
          halves: live.map((h) => h.code),
        });
      }
    }
    // The corrected event's row id is looked up by hash when written, so it must be written first.
    if (this.pending.some((p) => p.view.hash === corrects)) await this.flush(false);
    return null;
  }

  /** A fractured specimen becomes half A and half B, each starting its chain with split_from. */
  private async split(specimen: WorkItem, tested: EventView): Promise<string[]> {
    const codes = [halfCode(specimen.code, 'A'), halfCode(specimen.code, 'B')];
    const inserted = await this.query<LockRow>(
      `INSERT INTO items (code, kind, parent_item_id, half, state, projection)
       VALUES ($1, 'half', $3, 'A', 'none', $4::jsonb), ($2, 'half', $3, 'B', 'none', $5::jsonb)
       ON CONFLICT (code) DO NOTHING
       RETURNING id, code, kind, state, projection, last_seq, head_hash, parent_item_id, half,
                 NULL::text AS geometry_key, NULL::text AS area_policy, NULL::json AS stations, NULL::json AS refs`,
      [codes[0], codes[1], specimen.id, JSON.stringify(emptyProjection('half', codes[0])), JSON.stringify(emptyProjection('half', codes[1]))],
    );
    const rows = [...inserted];
    const missing = codes.filter((code) => !rows.some((r) => r.code === code) && !this.items.has(code));
    if (missing.length > 0) {
      // Halves left from a fracture that was voided: they continue their own chains.
      rows.push(...(await this.query<LockRow>(`${ITEM_SELECT} WHERE i.code = ANY($1::text[]) ORDER BY i.id FOR NO KEY UPDATE OF i`, [missing])));
    }
    for (const row of rows) this.items.set(row.code, workItem(row));
    for (const [index, code] of codes.entries()) {
      const half = this.items.get(code);
      if (!half) throw new Error(`half ${code} could not be created`);
      const side = index === 0 ? 'A' : 'B';
      const body: HashedEvent = {
        v: EVENT_FORMAT_VERSION,
        item: code,
        seq: half.projection.lastSeq + 1,
        type: 'split_from',
        actor: tested.actor,
        station: tested.station,
        container: null,
        occurredAt: tested.occurredAt,
        recordedAt: tested.recordedAt,
        payload: { from: specimen.code, half: side, fromEvent: tested.hash },
        idempotencyKey: `${tested.hash}:${side}`,
        corrects: null,
        signature: null,
        prevHash: half.projection.headHash,
      };
      const hash = computeEventHash(body);
      const result = applyEvent(half.projection, { ...body, hash });
      if (!result.ok) throw new Error(`split_from refused for ${code}: ${result.message}`);
      this.accept(half, result.projection, { id: 0, ...body, hash });
    }
    return codes;
  }

  /** Writes the pending events and the changed projections in one statement. */
  /**
   * Writes the pending events and their items' projections. The last flush of a unit (`last`)
   * closes it: in a transaction of its own, COMMIT goes with the write.
   */
  async flush(last = false): Promise<void> {
    if (this.pending.length === 0) {
      if (last) await this.db.close(null);
      return;
    }
    const events = this.pending.map(({ itemId, view }) => ({
      item_id: itemId,
      item_code: view.item,
      seq: view.seq,
      type: view.type,
      actor_user_id: view.actor.kind === 'user' ? view.actor.id : null,
      actor_token_id: view.actor.kind === 'instrument' ? view.actor.id : null,
      station_code: view.station,
      container_code: view.container,
      occurred_at: view.occurredAt,
      recorded_at: view.recordedAt,
      payload: view.payload,
      idempotency_key: view.idempotencyKey,
      corrects_hash: view.corrects,
      signature: view.signature,
      prev_hash: view.prevHash,
      hash: view.hash,
    }));
    const items = [...this.items.values()]
      .filter((item) => item.dirty)
      .map((item) => ({
        id: item.id,
        state: item.projection.state,
        projection: item.projection,
        last_seq: item.projection.lastSeq,
        head_hash: item.projection.headHash,
        last_event_at: item.lastEventAt,
        container_code: item.projection.container,
        station_code: item.projection.station,
      }));
    const write: WriteParams = [JSON.stringify(events), JSON.stringify(items), events.length];
    let row: WriteRow | null;
    try {
      row = last ? await this.db.close(write) : ((await this.query<WriteRow>(WRITE_EVENTS_SQL, write))[0] ?? null);
    } catch (error) {
      if (isKeyTaken(error)) throw new RetryUnit('an idempotency key was taken by another writer');
      throw error;
    }
    const inserted = row?.inserted ?? [];
    if (inserted.length !== events.length) throw new RetryUnit('an idempotency key was taken by another writer');
    const ids = new Map(inserted.map((r) => [r.key, Number(r.id)]));
    for (const { view } of this.pending) view.id = ids.get(view.idempotencyKey) ?? 0;
    for (const item of this.items.values()) item.dirty = false;
    this.pending = [];
  }
}

const RETRYABLE = new Set(['40P01', '40001']);

function pgCode(error: unknown): string | undefined {
  const e = error as { code?: string; parent?: { code?: string }; original?: { code?: string } };
  return e?.parent?.code ?? e?.original?.code ?? e?.code;
}

/** Refusals are kept outside the ledger, on their own connection, so they survive a rollback. */
export async function logRefusals(sequelize: Sequelize, opts: RecordOptions, pairs: { input: unknown; outcome: RefusedEvent }[]): Promise<void> {
  if (pairs.length === 0) return;
  const actor = opts.actor;
  const rows = pairs.map(({ input, outcome }) => {
    const i = (typeof input === 'object' && input !== null ? input : {}) as Record<string, unknown>;
    const text = (value: unknown) => (typeof value === 'string' ? value.slice(0, 200) : null);
    return {
      actor_user_id: actor.kind === 'user' ? actor.id : null,
      actor_token_id: actor.kind === 'instrument' ? actor.id : null,
      item_code: text(i.itemCode),
      type: text(i.type),
      idempotency_key: text(i.idempotencyKey),
      code: outcome.error.code,
      message: outcome.error.message,
      details: { status: outcome.status, ...(outcome.error.details === undefined ? {} : { details: outcome.error.details }) },
    };
  });
  await sequelize.query(INSERT_REFUSALS_SQL, { bind: [JSON.stringify(rows)] });
}

/**
 * Runs a unit of work. In its own transaction it retries after a deadlock, and after a refusal
 * or key clash found without the idempotency precheck (single scans skip that query on the fast
 * path); inside a caller's transaction it looks the keys up first and never retries.
 */
export async function runUnit(
  sequelize: Sequelize,
  maxSkewHours: number,
  events: readonly (PreparedEvent | RefusedEvent)[],
  opts: RecordOptions,
): Promise<EventOutcome[]> {
  if (opts.transaction) {
    try {
      return await new Unit(new TransactionDb(sequelize, opts.transaction), opts, true, maxSkewHours).run(events);
    } catch (error) {
      if (error instanceof RetryUnit) {
        throw conflict('idempotency_race', 'An idempotency key in this unit was recorded by another request at the same moment; send it again.');
      }
      throw error;
    }
  }
  let precheck = events.length > 1;
  const connections = sequelize.connectionManager as unknown as {
    getConnection: (options: { type: 'write' }) => Promise<pg.ClientBase>;
    releaseConnection: (connection: pg.ClientBase) => void;
  };
  for (let attempt = 1; ; attempt++) {
    const client = await connections.getConnection({ type: 'write' });
    const db = new PipelinedDb(client);
    try {
      return await new Unit(db, opts, precheck, maxSkewHours).run(events);
    } catch (error) {
      await db.rollback().catch(() => undefined);
      if (attempt < 5 && (error instanceof RetryUnit || RETRYABLE.has(pgCode(error) ?? ''))) {
        precheck = true;
        continue;
      }
      throw error;
    } finally {
      connections.releaseConnection(client);
    }
  }
}
