import type { Request, Response } from 'express';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { SampleCreateSchema, SampleListQuerySchema, SampleUpdateSchema, type SampleDetail } from '../../../shared/schemas/samples';
import { insertSample } from '../../commands/create-cut-list';
import { notFound, unprocessable } from '../../errors';
import { parsed } from '../../middleware/validate';
import { addFilter, containsPattern, orderBySql, runList, type ListSql } from '../../models/list-query';
import { canWriteIntake, presentPage } from '../../presenters/page';
import { presentSample, type SampleRow } from '../../presenters/sample';

const SELECT = `s.id, s.code, s.order_id, o.number AS order_number, s.heat_id, h.heat_number, s.position, s.orientation,
  s.thickness_mm, s.created_at, (SELECT count(*)::int FROM specimens sp WHERE sp.sample_id = s.id) AS specimen_count`;
const FROM = 'samples s JOIN orders o ON o.id = s.order_id JOIN heats h ON h.id = s.heat_id';
const SORTS = { code: 's.id', createdAt: 's.created_at', heat: 'lower(h.heat_number)', order: 'o.number' };

async function loadSample(req: Request, id: number): Promise<SampleRow & { customer_name: string; grade: string }> {
  const [rows] = await req.ctx.sequelize.query(
    `SELECT ${SELECT}, c.name AS customer_name, h.grade FROM ${FROM} JOIN customers c ON c.id = o.customer_id WHERE s.id = $1`,
    { bind: [id] },
  );
  const row = (rows as (SampleRow & { customer_name: string; grade: string })[])[0];
  if (!row) throw notFound(`No sample has id ${id}.`);
  return row;
}

/** GET /api/samples: search by code, heat, order or position; filter by order and heat. */
export async function listSamples(req: Request, res: Response): Promise<void> {
  const query = parsed(req, SampleListQuerySchema, 'query');
  const sql: ListSql = { select: SELECT, from: FROM, where: [], bind: [] };
  if (query.q) addFilter(sql, '(s.code ILIKE ? OR h.heat_number ILIKE ? OR o.number ILIKE ? OR s.position ILIKE ?)', containsPattern(query.q));
  if (query.orderId) addFilter(sql, 's.order_id = ?', query.orderId);
  if (query.heatId) addFilter(sql, 's.heat_id = ?', query.heatId);
  const { rows, total } = await runList<SampleRow>(req.ctx.sequelize, sql, orderBySql(query.sort, SORTS, 's.id'), query.page, query.pageSize);
  res.json(presentPage(rows.map(presentSample), total, query, req.actor));
}

/** POST /api/samples: a sample of a heat that is on the order. */
export async function createSample(req: Request, res: Response): Promise<void> {
  const body = parsed(req, SampleCreateSchema);
  const order = await req.ctx.models.Order.findByPk(body.orderId);
  if (!order) throw unprocessable(`No order has id ${body.orderId}.`, [{ path: 'orderId', message: 'Choose an order from the list.' }]);
  const sample = await req.ctx.sequelize.transaction((transaction) =>
    insertSample(req.ctx, { orderId: body.orderId, heatId: body.heatId, position: body.position, orientation: body.orientation, thicknessMm: body.thicknessMm ?? null }, transaction),
  );
  res.status(201).json(presentSample(await loadSample(req, sample.id)));
}

/** GET /api/samples/:id: the sample, its order and heat, and its specimens. */
export async function getSample(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const row = await loadSample(req, id);
  const [specimens] = await req.ctx.sequelize.query(
    `SELECT i.id::int AS id, i.code, i.state, sp.geometry_key AS "geometryKey", sp.shape
       FROM specimens sp JOIN items i ON i.id = sp.item_id WHERE sp.sample_id = $1 ORDER BY sp.serial`,
    { bind: [id] },
  );
  const detail: SampleDetail = {
    ...presentSample(row),
    customerName: row.customer_name,
    grade: row.grade,
    specimens: specimens as SampleDetail['specimens'],
    canWrite: canWriteIntake(req.actor),
  };
  res.json(detail);
}

/** PATCH /api/samples/:id: position, orientation, thickness. */
export async function updateSample(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const body = parsed(req, SampleUpdateSchema);
  const sample = await req.ctx.models.Sample.findByPk(id);
  if (!sample) throw notFound(`No sample has id ${id}.`);
  await sample.update(body);
  res.json(presentSample(await loadSample(req, id)));
}
