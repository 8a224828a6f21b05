import type { Request, Response } from 'express';
import type { Transaction } from 'sequelize';
import { CutListCreateSchema } from '../../../shared/schemas/cut-list';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import {
  OrderCreateSchema,
  OrderHeatAddSchema,
  OrderListQuerySchema,
  OrderUpdateSchema,
  type OrderDetail,
} from '../../../shared/schemas/orders';
import { createCutList } from '../../commands/create-cut-list';
import { importCutList, previewCutList } from '../../commands/import-cut-list';
import { conflict, notFound, unprocessable } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { addFilter, containsPattern, orderBySql, runList, type ListSql } from '../../models/list-query';
import { presentHeat, type HeatRow } from '../../presenters/heat';
import { presentOrder, type OrderRow } from '../../presenters/order';
import { canWriteIntake, presentPage } from '../../presenters/page';
import { HEAT_SELECT, insertHeat } from '../heats/handlers';

const SELECT = `o.id, o.number, o.customer_id, c.name AS customer_name, o.po_reference, o.material_spec, o.tests_requested,
  o.specimens_per_heat, o.geometry_key, o.test_standard, o.area_policy, o.retention_days, o.retention_basis,
  to_char(o.due_date, 'YYYY-MM-DD') AS due_date, o.status, o.created_at,
  (SELECT count(*)::int FROM order_heats oh WHERE oh.order_id = o.id) AS heat_count,
  (SELECT count(*)::int FROM specimens sp JOIN samples s ON s.id = sp.sample_id WHERE s.order_id = o.id) AS specimen_count`;
const FROM = 'orders o JOIN customers c ON c.id = o.customer_id';
const SORTS = { number: 'o.number', dueDate: 'o.due_date', createdAt: 'o.created_at', customer: 'lower(c.name)', status: 'o.status' };

async function loadOrder(req: Request, id: number): Promise<OrderRow> {
  const [rows] = await req.ctx.sequelize.query(`SELECT ${SELECT} FROM ${FROM} WHERE o.id = $1`, { bind: [id] });
  const row = (rows as OrderRow[])[0];
  if (!row) throw notFound(`No order has id ${id}.`);
  return row;
}

async function assertCustomer(req: Request, customerId: number, transaction?: Transaction): Promise<void> {
  const customer = await req.ctx.models.Customer.findByPk(customerId, { transaction });
  if (!customer) throw unprocessable(`No customer has id ${customerId}.`, [{ path: 'customerId', message: 'Choose a customer from the list.' }]);
}

async function assertNumberFree(req: Request, number: string, exceptId = 0): Promise<void> {
  const [rows] = await req.ctx.sequelize.query(`SELECT id FROM orders WHERE lower(number) = lower($1) AND id <> $2`, { bind: [number, exceptId] });
  if ((rows as unknown[]).length > 0) {
    throw conflict('duplicate', `Order number ${number} is already used.`, [{ path: 'number', message: 'Another order has this number.' }]);
  }
}

/**
 * Puts a heat on an order, refusing the same heat twice with a message that names both.
 *
 * @param req - The request (for its context).
 * @param order - The order's id and number.
 * @param heatId - The heat.
 */
async function linkHeat(req: Request, order: { id: number; number: string }, heatId: number, transaction: Transaction): Promise<void> {
  const heat = await req.ctx.models.Heat.findByPk(heatId, { transaction });
  if (!heat) throw unprocessable(`No heat has id ${heatId}.`, [{ path: 'heatId', message: 'Choose a heat from the list.' }]);
  const [rows] = await req.ctx.sequelize.query(`SELECT 1 FROM order_heats WHERE order_id = $1 AND heat_id = $2`, { bind: [order.id, heatId], transaction });
  if ((rows as unknown[]).length > 0) {
    throw conflict('heat_already_on_order', `Heat ${heat.heatNumber} (${heat.producer}) is already on order ${order.number}; a heat is listed once per order.`, [
      { path: 'heatId', message: `Heat ${heat.heatNumber} is already on this order.` },
    ]);
  }
  await req.ctx.sequelize.query(`INSERT INTO order_heats (order_id, heat_id) VALUES ($1, $2)`, { bind: [order.id, heatId], transaction });
}

/** GET /api/orders: search by number, PO, specification or customer; filter by customer, status, heat. */
export async function listOrders(req: Request, res: Response): Promise<void> {
  const query = parsed(req, OrderListQuerySchema, 'query');
  const sql: ListSql = { select: SELECT, from: FROM, where: [], bind: [] };
  if (query.q) addFilter(sql, '(o.number ILIKE ? OR o.po_reference ILIKE ? OR o.material_spec ILIKE ? OR c.name ILIKE ?)', containsPattern(query.q));
  if (query.customerId) addFilter(sql, 'o.customer_id = ?', query.customerId);
  if (query.status) addFilter(sql, 'o.status = ?', query.status);
  if (query.heatId) addFilter(sql, 'EXISTS (SELECT 1 FROM order_heats oh WHERE oh.order_id = o.id AND oh.heat_id = ?)', query.heatId);
  const { rows, total } = await runList<OrderRow>(req.ctx.sequelize, sql, orderBySql(query.sort, SORTS, 'o.id'), query.page, query.pageSize);
  res.json(presentPage(rows.map(presentOrder), total, query, req.actor));
}

/** POST /api/orders: the order and, at once, the existing heats it covers. */
export async function createOrder(req: Request, res: Response): Promise<void> {
  const { heatIds, ...body } = parsed(req, OrderCreateSchema);
  await assertNumberFree(req, body.number);
  const id = await req.ctx.sequelize.transaction(async (transaction) => {
    await assertCustomer(req, body.customerId, transaction);
    const order = await req.ctx.models.Order.create(
      { ...body, retentionDays: body.retentionDays ?? null, dueDate: body.dueDate ?? null },
      { transaction },
    );
    for (const heatId of heatIds ?? []) await linkHeat(req, order, heatId, transaction);
    return order.id;
  });
  res.status(201).json(presentOrder(await loadOrder(req, id)));
}

/** GET /api/orders/:id: the order with its heats and samples. */
export async function getOrder(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const order = presentOrder(await loadOrder(req, id));
  const q = req.ctx.sequelize;
  const [heats] = await q.query(
    `SELECT ${HEAT_SELECT}, (SELECT count(*)::int FROM samples s WHERE s.heat_id = h.id AND s.order_id = $1) AS sample_count
       FROM order_heats oh JOIN heats h ON h.id = oh.heat_id WHERE oh.order_id = $1 ORDER BY lower(h.heat_number), h.id`,
    { bind: [id] },
  );
  const [samples] = await q.query(
    `SELECT s.id, s.code, s.heat_id AS "heatId", h.heat_number AS "heatNumber", s.position, s.orientation,
            s.thickness_mm AS "thicknessMm", (SELECT count(*)::int FROM specimens sp WHERE sp.sample_id = s.id) AS "specimenCount"
       FROM samples s JOIN heats h ON h.id = s.heat_id WHERE s.order_id = $1 ORDER BY s.id`,
    { bind: [id] },
  );
  const detail: OrderDetail = {
    ...order,
    heats: (heats as (HeatRow & { sample_count: number })[]).map((h) => ({ ...presentHeat(h), sampleCount: h.sample_count })),
    samples: samples as OrderDetail['samples'],
    canWrite: canWriteIntake(req.actor),
  };
  res.json(detail);
}

/** PATCH /api/orders/:id */
export async function updateOrder(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const body = parsed(req, OrderUpdateSchema);
  const order = await req.ctx.models.Order.findByPk(id);
  if (!order) throw notFound(`No order has id ${id}.`);
  if (body.number !== undefined) await assertNumberFree(req, body.number, id);
  if (body.customerId !== undefined) await assertCustomer(req, body.customerId);
  await order.update(body);
  res.json(presentOrder(await loadOrder(req, id)));
}

/** POST /api/orders/:id/heats: puts an existing heat, or a newly registered one, on the order. */
export async function addOrderHeat(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const body = parsed(req, OrderHeatAddSchema);
  const heatId = await req.ctx.sequelize.transaction(async (transaction) => {
    const order = await req.ctx.models.Order.findByPk(id, { transaction, lock: transaction.LOCK.UPDATE });
    if (!order) throw notFound(`No order has id ${id}.`);
    const heatId = body.heat ? await insertHeat(req, body.heat, transaction) : body.heatId!;
    await linkHeat(req, order, heatId, transaction);
    return heatId;
  });
  const [rows] = await req.ctx.sequelize.query(`SELECT ${HEAT_SELECT} FROM heats h WHERE h.id = $1`, { bind: [heatId] });
  res.status(201).json(presentHeat((rows as HeatRow[])[0]!));
}

/** POST /api/orders/:id/cut-list: one sample per heat and its specimens, all or nothing. */
export async function makeCutList(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  res.status(201).json(await createCutList(req.ctx, id, parsed(req, CutListCreateSchema), currentUser(req)));
}

/** POST /api/orders/:id/cut-list/preview (multipart "file"): each row checked, nothing written. */
export async function previewCutListCsv(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  res.json(await previewCutList(req.ctx, id, req.file!.buffer));
}

/** POST /api/orders/:id/cut-list/import (multipart "file"): every row written, or none. */
export async function importCutListCsv(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  res.status(201).json(await importCutList(req.ctx, id, req.file!.buffer, currentUser(req)));
}
