/**
 * Making samples and specimens: one sample, one specimen, or a whole cut list for an order, each
 * inside the caller's transaction so that a cut list is written whole or not at all.
 */
import type { Transaction } from 'sequelize';
import { specimenCode } from '../../shared/domain/codes';
import { getGeometry } from '../../shared/domain/specimen-geometries';
import type { CutListCreate, CutListResult } from '../../shared/schemas/cut-list';
import { nominalFor } from '../../shared/schemas/specimens';
import type { AppContext } from '../app';
import { conflict, notFound, unprocessable } from '../errors';
import { registerItem, type LedgerActor } from './record-event';

/** What a new sample needs. */
export interface NewSample {
  orderId: number;
  heatId: number;
  position: string;
  orientation: string;
  thicknessMm: string | null;
}

/** A sample as the commands use it. */
export interface SampleRef {
  id: number;
  code: string;
  heatId: number;
  heatNumber: string;
  orderNumber: string;
  thicknessMm: string | null;
}

/** What a run of specimens from one sample needs. */
export interface SpecimenRun {
  sample: SampleRef;
  geometryKey: string;
  testStandard: string;
  count: number;
  /** The person registering them; each specimen's `registered` event names them. */
  actor: LedgerActor;
  /** When they were registered, as the device saw it; the server's now when left out. */
  occurredAt?: string;
}

/**
 * Checks that a heat is on an order: a sample is a piece of one heat received for one order.
 *
 * @returns The heat's and the order's numbers.
 */
async function heatOnOrder(ctx: AppContext, orderId: number, heatId: number, transaction: Transaction): Promise<{ heat_number: string; order_number: string }> {
  const [rows] = await ctx.sequelize.query(
    `SELECT h.heat_number, o.number AS order_number FROM order_heats oh JOIN heats h ON h.id = oh.heat_id
       JOIN orders o ON o.id = oh.order_id WHERE oh.order_id = $1 AND oh.heat_id = $2`,
    { bind: [orderId, heatId], transaction },
  );
  const row = (rows as { heat_number: string; order_number: string }[])[0];
  if (!row) {
    throw unprocessable('This heat is not on the order; add the heat to the order first.', [
      { path: 'heatId', message: 'Choose a heat that is on the order.' },
    ]);
  }
  return row;
}

/**
 * Registers a sample with the next sample code (P, two-digit year, five-digit serial).
 *
 * @param ctx - The app context.
 * @param sample - Order, heat, position, orientation, thickness.
 * @param transaction - The caller's transaction.
 */
export async function insertSample(ctx: AppContext, sample: NewSample, transaction: Transaction): Promise<SampleRef> {
  const { heat_number: heatNumber, order_number: orderNumber } = await heatOnOrder(ctx, sample.orderId, sample.heatId, transaction);
  const [rows] = await ctx.sequelize.query(
    `INSERT INTO samples (code, order_id, heat_id, position, orientation, thickness_mm)
     SELECT 'P' || to_char(now() AT TIME ZONE 'UTC', 'YY') || '-' || lpad(nextval('sample_serial_seq')::text, 5, '0'), $1, $2, $3, $4, $5
     RETURNING id, code, thickness_mm`,
    { bind: [sample.orderId, sample.heatId, sample.position, sample.orientation, sample.thicknessMm], transaction },
  );
  const row = (rows as { id: number; code: string; thickness_mm: string | null }[])[0]!;
  return { id: row.id, code: row.code, heatId: sample.heatId, heatNumber, orderNumber, thicknessMm: row.thickness_mm };
}

/**
 * Registers specimens cut from one sample: for each, an item with the next specimen code and its
 * `registered` custody event (through the ledger's registerItem), and its specimen row with the
 * nominal sizes of its geometry.
 *
 * @param ctx - The app context.
 * @param run - The sample, geometry, standard and how many.
 * @param transaction - The caller's transaction.
 * @returns The new specimens' item ids and codes, in serial order.
 */
export async function registerSpecimens(ctx: AppContext, run: SpecimenRun, transaction: Transaction): Promise<{ id: number; code: string }[]> {
  const geometry = getGeometry(run.geometryKey);
  if (!geometry) throw unprocessable('Choose a specimen geometry from the list.', [{ path: 'geometryKey', message: 'Choose a specimen geometry from the list.' }]);
  const nominal = nominalFor(geometry, run.sample.thicknessMm);
  const made: { id: number; code: string }[] = [];
  const [serials] = await ctx.sequelize.query(
    `SELECT nextval('specimen_serial_seq')::int AS serial, extract(year FROM now() AT TIME ZONE 'UTC')::int AS year FROM generate_series(1, $1)`,
    { bind: [run.count], transaction },
  );
  for (const { serial, year } of serials as { serial: number; year: number }[]) {
    const code = specimenCode(year, serial);
    const { itemId } = await registerItem(
      ctx,
      {
        kind: 'specimen',
        code,
        occurredAt: run.occurredAt,
        payload: { sample: run.sample.code, heat: run.sample.heatNumber, order: run.sample.orderNumber, geometry: geometry.key, testStandard: run.testStandard },
      },
      { actor: run.actor, transaction },
    );
    await ctx.sequelize.query(
      `INSERT INTO specimens (item_id, sample_id, serial, geometry_key, shape, test_standard, nominal)
       VALUES ($1, $2, $3, $4, $5, $6, $7)`,
      { bind: [itemId, run.sample.id, serial, geometry.key, geometry.shape, run.testStandard, JSON.stringify(nominal)], transaction },
    );
    made.push({ id: itemId, code });
  }
  return made;
}

/** One line of a cut list's plan: a sample (new or existing) and the specimens to cut from it. */
export type CutListLine =
  | { sampleId: number; count: number; geometryKey: string }
  | { newSample: Omit<NewSample, 'orderId'>; count: number; geometryKey: string };

/** The parts of an order a cut list reads. */
interface OrderPlan {
  id: number;
  number: string;
  specimensPerHeat: number;
  geometryKey: string;
  testStandard: string;
}

async function loadOrderPlan(ctx: AppContext, orderId: number, transaction: Transaction): Promise<OrderPlan> {
  // FOR UPDATE: two cut lists for one order run one after the other, never interleaved.
  const [rows] = await ctx.sequelize.query(
    `SELECT id, number, specimens_per_heat, geometry_key, test_standard FROM orders WHERE id = $1 FOR UPDATE`,
    { bind: [orderId], transaction },
  );
  const row = (rows as { id: number; number: string; specimens_per_heat: number; geometry_key: string; test_standard: string }[])[0];
  if (!row) throw notFound(`No order has id ${orderId}.`);
  return { id: row.id, number: row.number, specimensPerHeat: row.specimens_per_heat, geometryKey: row.geometry_key, testStandard: row.test_standard };
}

/**
 * Writes a cut-list plan for an order: each line's sample (made or reused) and its specimens.
 * Runs inside the caller's transaction; any refusal undoes every line.
 *
 * @param ctx - The app context.
 * @param orderId - The order.
 * @param lines - The plan.
 * @param actor - Who registers the specimens.
 * @param transaction - The caller's transaction.
 * @param opts - `occurredAt`: the registration time the device reported (the server's now when left out).
 */
export async function writeCutList(
  ctx: AppContext,
  orderId: number,
  lines: CutListLine[],
  actor: LedgerActor,
  transaction: Transaction,
  opts: { occurredAt?: string } = {},
): Promise<CutListResult> {
  const order = await loadOrderPlan(ctx, orderId, transaction);
  const result: CutListResult = { orderId, samples: [], specimens: [] };
  for (const line of lines) {
    let sample: SampleRef;
    if ('sampleId' in line) {
      const [rows] = await ctx.sequelize.query(
        `SELECT s.id, s.code, s.heat_id, s.thickness_mm, s.order_id, h.heat_number FROM samples s JOIN heats h ON h.id = s.heat_id WHERE s.id = $1 FOR UPDATE OF s`,
        { bind: [line.sampleId], transaction },
      );
      const row = (rows as { id: number; code: string; heat_id: number; thickness_mm: string | null; order_id: number; heat_number: string }[])[0];
      if (!row) throw unprocessable(`No sample has id ${line.sampleId}.`, [{ path: 'sampleIds', message: `No sample has id ${line.sampleId}.` }]);
      if (row.order_id !== orderId) {
        throw unprocessable(`Sample ${row.code} belongs to another order.`, [{ path: 'sampleIds', message: `Sample ${row.code} is not on order ${order.number}.` }]);
      }
      sample = { id: row.id, code: row.code, heatId: row.heat_id, heatNumber: row.heat_number, orderNumber: order.number, thicknessMm: row.thickness_mm };
      result.samples.push({ ...pickSample(sample), created: false });
    } else {
      sample = await insertSample(ctx, { ...line.newSample, orderId }, transaction);
      result.samples.push({ ...pickSample(sample), created: true });
    }
    const specimens = await registerSpecimens(
      ctx,
      { sample, geometryKey: line.geometryKey, testStandard: order.testStandard, count: line.count, actor, occurredAt: opts.occurredAt },
      transaction,
    );
    result.specimens.push(...specimens.map((s) => ({ ...s, sampleId: sample.id, heatNumber: sample.heatNumber })));
  }
  return result;
}

function pickSample(s: SampleRef) {
  return { id: s.id, code: s.code, heatId: s.heatId, heatNumber: s.heatNumber };
}

/**
 * Makes an order's cut list in one transaction: for each heat on the order, the given sample(s)
 * of that heat or one new sample, and `specimensPerHeat` specimens (the order's number by default)
 * from each, in the order's geometry and standard.
 *
 * @param ctx - The app context.
 * @param orderId - The order.
 * @param input - Specimens per heat, the new samples' position, orientation and thickness, samples to reuse.
 * @param actor - Who registers the specimens.
 * @param opts - `occurredAt`: the registration time the device reported (the server's now when left out).
 */
export async function createCutList(
  ctx: AppContext,
  orderId: number,
  input: CutListCreate,
  actor: LedgerActor,
  opts: { occurredAt?: string } = {},
): Promise<CutListResult> {
  return ctx.sequelize.transaction(async (transaction) => {
    const order = await loadOrderPlan(ctx, orderId, transaction);
    const [heatRows] = await ctx.sequelize.query(
      `SELECT oh.heat_id FROM order_heats oh JOIN heats h ON h.id = oh.heat_id WHERE oh.order_id = $1 ORDER BY lower(h.heat_number), h.id`,
      { bind: [orderId], transaction },
    );
    const heats = (heatRows as { heat_id: number }[]).map((r) => r.heat_id);
    if (heats.length === 0) throw conflict('no_heats', `Order ${order.number} has no heats yet; add its heats before making the cut list.`);
    const given = new Map<number, number[]>();
    if (input.sampleIds?.length) {
      const [rows] = await ctx.sequelize.query(`SELECT id, heat_id, order_id, code FROM samples WHERE id = ANY($1::int[])`, {
        bind: [input.sampleIds],
        transaction,
      });
      const found = rows as { id: number; heat_id: number; order_id: number; code: string }[];
      for (const id of input.sampleIds) {
        const s = found.find((r) => r.id === id);
        if (!s) throw unprocessable(`No sample has id ${id}.`, [{ path: 'sampleIds', message: `No sample has id ${id}.` }]);
        if (s.order_id !== orderId) throw unprocessable(`Sample ${s.code} belongs to another order.`, [{ path: 'sampleIds', message: `Sample ${s.code} is not on order ${order.number}.` }]);
        given.set(s.heat_id, [...(given.get(s.heat_id) ?? []), s.id]);
      }
    }
    const count = input.specimensPerHeat ?? order.specimensPerHeat;
    const lines: CutListLine[] = heats.flatMap((heatId): CutListLine[] => {
      const reuse = given.get(heatId);
      if (reuse) return reuse.map((sampleId) => ({ sampleId, count, geometryKey: order.geometryKey }));
      return [{
        newSample: { heatId, position: input.position, orientation: input.orientation, thicknessMm: input.thicknessMm ?? null },
        count,
        geometryKey: order.geometryKey,
      }];
    });
    return writeCutList(ctx, orderId, lines, actor, transaction, opts);
  });
}
