import type { Request, Response } from 'express';
import type { Transaction } from 'sequelize';
import { HeatCreateSchema, HeatListQuerySchema, HeatUpdateSchema, type HeatCreate, type HeatDetail } from '../../../shared/schemas/heats';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { conflict, notFound } from '../../errors';
import { parsed } from '../../middleware/validate';
import { addFilter, containsPattern, orderBySql, runList, type ListSql } from '../../models/list-query';
import { presentHeat, type HeatRow } from '../../presenters/heat';
import { canWriteIntake, presentPage } from '../../presenters/page';

/** Columns of a heat row with its counts; `h` is the heats table. */
export const HEAT_SELECT = `h.id, h.heat_number, h.material, h.grade, h.producer, h.certificate_ref, h.created_at,
  (SELECT count(*)::int FROM order_heats oh WHERE oh.heat_id = h.id) AS order_count,
  (SELECT count(*)::int FROM specimens sp JOIN samples s ON s.id = sp.sample_id WHERE s.heat_id = h.id) AS specimen_count`;
const SORTS = { heatNumber: 'lower(h.heat_number)', producer: 'lower(h.producer)', grade: 'lower(h.grade)', createdAt: 'h.created_at' };

async function loadHeat(req: Request, id: number): Promise<HeatRow> {
  const [rows] = await req.ctx.sequelize.query(`SELECT ${HEAT_SELECT} FROM heats h WHERE h.id = $1`, { bind: [id] });
  const row = (rows as HeatRow[])[0];
  if (!row) throw notFound(`No heat has id ${id}.`);
  return row;
}

/**
 * Refuses a heat number a producer already used: the pair identifies the melt.
 *
 * @param req - The request (for its context).
 * @param heat - Number and producer.
 * @param exceptId - The heat being changed, when changing one.
 */
export async function assertHeatFree(req: Request, heat: { heatNumber: string; producer: string }, exceptId = 0, transaction?: Transaction): Promise<void> {
  const [rows] = await req.ctx.sequelize.query(
    `SELECT id FROM heats WHERE lower(heat_number) = lower($1) AND lower(producer) = lower($2) AND id <> $3`,
    { bind: [heat.heatNumber, heat.producer, exceptId], transaction },
  );
  const existing = (rows as { id: number }[])[0];
  if (existing) {
    throw conflict('duplicate', `Heat ${heat.heatNumber} from ${heat.producer} is already registered.`, [
      { path: 'heatNumber', message: 'This producer already has a heat with this number.' },
    ]);
  }
}

/**
 * Registers a heat.
 *
 * @param req - The request (for its context).
 * @param body - The heat's fields.
 */
export async function insertHeat(req: Request, body: HeatCreate, transaction?: Transaction): Promise<number> {
  await assertHeatFree(req, body, 0, transaction);
  const heat = await req.ctx.models.Heat.create(
    { heatNumber: body.heatNumber, material: body.material, grade: body.grade, producer: body.producer, certificateRef: body.certificateRef ?? null },
    { transaction },
  );
  return heat.id;
}

/** GET /api/heats: search by number, material, grade, producer or certificate; filter by order. */
export async function listHeats(req: Request, res: Response): Promise<void> {
  const query = parsed(req, HeatListQuerySchema, 'query');
  const sql: ListSql = { select: HEAT_SELECT, from: 'heats h', where: [], bind: [] };
  if (query.q) {
    addFilter(sql, "(h.heat_number ILIKE ? OR h.material ILIKE ? OR h.grade ILIKE ? OR h.producer ILIKE ? OR coalesce(h.certificate_ref, '') ILIKE ?)", containsPattern(query.q));
  }
  if (query.orderId) addFilter(sql, 'EXISTS (SELECT 1 FROM order_heats oh WHERE oh.heat_id = h.id AND oh.order_id = ?)', query.orderId);
  const { rows, total } = await runList<HeatRow>(req.ctx.sequelize, sql, orderBySql(query.sort, SORTS, 'h.id'), query.page, query.pageSize);
  res.json(presentPage(rows.map(presentHeat), total, query, req.actor));
}

/** POST /api/heats */
export async function createHeat(req: Request, res: Response): Promise<void> {
  const id = await insertHeat(req, parsed(req, HeatCreateSchema));
  res.status(201).json(presentHeat(await loadHeat(req, id)));
}

/** GET /api/heats/:id: the heat, the orders it is on, and its samples. */
export async function getHeat(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const heat = presentHeat(await loadHeat(req, id));
  const q = req.ctx.sequelize;
  const [orders] = await q.query(
    `SELECT o.id, o.number, c.name AS "customerName", o.status FROM order_heats oh
       JOIN orders o ON o.id = oh.order_id JOIN customers c ON c.id = o.customer_id
      WHERE oh.heat_id = $1 ORDER BY o.created_at DESC, o.id DESC`,
    { bind: [id] },
  );
  const [samples] = await q.query(
    `SELECT s.id, s.code, s.order_id AS "orderId", o.number AS "orderNumber", s.position, s.orientation,
            (SELECT count(*)::int FROM specimens sp WHERE sp.sample_id = s.id) AS "specimenCount"
       FROM samples s JOIN orders o ON o.id = s.order_id WHERE s.heat_id = $1 ORDER BY s.id`,
    { bind: [id] },
  );
  const detail: HeatDetail = {
    ...heat,
    orders: orders as HeatDetail['orders'],
    samples: samples as HeatDetail['samples'],
    canWrite: canWriteIntake(req.actor),
  };
  res.json(detail);
}

/** PATCH /api/heats/:id */
export async function updateHeat(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const body = parsed(req, HeatUpdateSchema);
  const heat = await req.ctx.models.Heat.findByPk(id);
  if (!heat) throw notFound(`No heat has id ${id}.`);
  if (body.heatNumber !== undefined || body.producer !== undefined) {
    await assertHeatFree(req, { heatNumber: body.heatNumber ?? heat.heatNumber, producer: body.producer ?? heat.producer }, id);
  }
  await heat.update(body);
  res.json(presentHeat(await loadHeat(req, id)));
}
