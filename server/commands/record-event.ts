/**
 * Recording custody events: one scan, a batch of scans, and the registration of a new item
 * with its first event. Every write to the ledger goes through here.
 */
import { randomUUID } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { emptyProjection, type ItemKind } from '../../shared/domain/ledger/state-machine';
import { EventInputSchema, type EventInput, type ParsedEventInput } from '../../shared/schemas/events';
import type { AppContext } from '../app';
import { AppError } from '../errors';
import { fieldIssues } from '../middleware/validate';
import { logRefusals, prepareEvent, refused, runUnit, type PreparedEvent } from '../ledger/engine';
import { isRecorded, type EventOutcome, type RecordedEvent, type RecordOptions, type RefusedEvent } from '../ledger/types';

export type { LedgerActor, RecordedEvent, RecordOptions, EventOutcome, EventView, ItemSummary } from '../ledger/types';

function parseInput(input: unknown): ParsedEventInput | RefusedEvent {
  const parsed = EventInputSchema.safeParse(input);
  if (!parsed.success) return refused(422, 'invalid', 'Some fields of the event are not valid; see details.', fieldIssues(parsed.error));
  return parsed.data;
}

function isRefusal(value: unknown): value is RefusedEvent {
  return typeof value === 'object' && value !== null && 'status' in value && 'error' in value;
}

/** The AppError the API answers with for a refused event. */
export function refusalError(outcome: RefusedEvent): AppError {
  return new AppError(outcome.status, outcome.error.code, outcome.error.message, outcome.error.details);
}

/**
 * Records one custody event in one transaction (or in `opts.transaction`): resolves the item by
 * its code, locks its row, answers a repeated idempotency key with the stored event
 * (`replayed: true`, status 200), checks the actor, the device's clock, the state machine, the
 * container and the payload, computes the hash and appends the event, and updates the item's
 * projection. A fractured `tested` also creates half A and half B with their `split_from`
 * events. A refusal is logged in scan_refusals (which survives the rollback) and thrown as an
 * AppError: 403, 404, 409 (`state_refused` with `{state, allowed, message}`), 422.
 */
export async function recordEvent(ctx: AppContext, input: EventInput | ParsedEventInput | unknown, opts: RecordOptions): Promise<RecordedEvent> {
  const parsed = parseInput(input);
  const prepared = isRefusal(parsed) ? parsed : prepareEvent(parsed, opts);
  let outcome: EventOutcome;
  if (isRefusal(prepared)) {
    outcome = prepared;
  } else {
    [outcome] = await runUnit(ctx.sequelize, ctx.config.MAX_CLOCK_SKEW_HOURS, [prepared], opts);
  }
  if (isRecorded(outcome)) return outcome;
  await logRefusals(ctx.sequelize, opts, [{ input, outcome }]);
  throw refusalError(outcome);
}

/**
 * Records many events, each judged alone and in order (offline sync, a cell's night of scans):
 * one outcome per event, in the same order, each a recorded event (201), a replay (200) or a
 * refusal with its error. Accepted events are committed together; refusals are logged. Voids
 * are refused here: each needs its own signature, so they go through recordEvent one by one.
 */
export async function recordEvents(ctx: AppContext, inputs: readonly unknown[], opts: RecordOptions): Promise<EventOutcome[]> {
  const prepared: (PreparedEvent | RefusedEvent)[] = inputs.map((input) => {
    const parsed = parseInput(input);
    if (isRefusal(parsed)) return parsed;
    if (parsed.type === 'voided') {
      return refused(422, 'void_in_batch', 'Void events one at a time, each with its own signature.', [{ path: 'type', message: 'voided is not accepted in a batch' }]);
    }
    return prepareEvent(parsed, opts);
  });
  const outcomes = prepared.every(isRefusal) ? prepared : await runUnit(ctx.sequelize, ctx.config.MAX_CLOCK_SKEW_HOURS, prepared, opts);
  const refusals = outcomes.flatMap((outcome, i) => (isRecorded(outcome) ? [] : [{ input: inputs[i], outcome }]));
  await logRefusals(ctx.sequelize, opts, refusals);
  return outcomes;
}

/** A new item to register: its row is inserted and its `registered` event recorded together. */
export interface NewItem {
  kind: Exclude<ItemKind, 'half'>;
  /** Display-form code, e.g. from specimenCode(year, serial) or containerCode(serial). */
  code: string;
  stationCode?: string;
  /** For a container: the container it is placed in, if any. */
  containerCode?: string | null;
  /** The device's time; the server's now when left out. */
  occurredAt?: string;
  payload?: Record<string, unknown>;
  /** A key the caller can retry with; a fresh UUID when left out. */
  idempotencyKey?: string;
}

/**
 * Registers a specimen or a container: inserts its items row (state `none`) and records its
 * `registered` event, in `opts.transaction` when given (intake inserts the specimens row in the
 * same transaction, after this returns the item's id) or else in a transaction of its own.
 */
export async function registerItem(
  ctx: AppContext,
  item: NewItem,
  opts: RecordOptions,
): Promise<{ itemId: number; recorded: RecordedEvent }> {
  const run = async (transaction: Transaction) => {
    const [row] = await ctx.sequelize.query<{ id: string }>(
      `INSERT INTO items (code, kind, state, projection) VALUES ($1, $2, 'none', $3::jsonb) RETURNING id`,
      { bind: [item.code, item.kind, JSON.stringify(emptyProjection(item.kind, item.code))], transaction, type: QueryTypes.SELECT },
    );
    const recorded = await recordEvent(
      ctx,
      {
        idempotencyKey: item.idempotencyKey ?? randomUUID(),
        type: 'registered',
        itemCode: item.code,
        stationCode: item.stationCode,
        containerCode: item.containerCode ?? null,
        occurredAt: item.occurredAt ?? new Date().toISOString(),
        payload: item.payload ?? {},
      },
      { ...opts, transaction, allowRegistration: true },
    );
    return { itemId: Number(row?.id), recorded };
  };
  return opts.transaction ? run(opts.transaction) : ctx.sequelize.transaction(run);
}
