import type { Request, Response } from 'express';
import { z } from 'zod';
import { normalizeCode, parseCode } from '../../../shared/domain/codes';
import { getGeometry } from '../../../shared/domain/specimen-geometries';
import {
  SpecimenCreateSchema,
  SpecimenListQuerySchema,
  SpecimenUpdateSchema,
  nominalFor,
  type SpecimenDetail,
  type SpecimenNominal,
} from '../../../shared/schemas/specimens';
import { registerSpecimens } from '../../commands/create-cut-list';
import { AppError, conflict, notFound, unprocessable } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { addFilter, containsPattern, orderBySql, runList, type ListSql } from '../../models/list-query';
import { canWriteIntake, presentPage } from '../../presenters/page';
import { presentSpecimen, type SpecimenRow } from '../../presenters/specimen';

/** Route parameters `/:idOrCode`: an item id, or a specimen code in any accepted form. */
export const SpecimenRefParamsSchema = z.object({ idOrCode: z.string().trim().min(1) });

const SELECT = `i.id, i.code, i.state, sp.shape, sp.geometry_key, sp.test_standard, sp.sample_id, s.code AS sample_code,
  s.heat_id, h.heat_number, s.order_id, o.number AS order_number, sp.created_at`;
const FROM = `specimens sp JOIN items i ON i.id = sp.item_id JOIN samples s ON s.id = sp.sample_id
  JOIN heats h ON h.id = s.heat_id JOIN orders o ON o.id = s.order_id`;
const SORTS = { code: 'sp.serial', state: 'i.state', createdAt: 'sp.created_at', heat: 'lower(h.heat_number)', order: 'o.number' };

type DetailRow = SpecimenRow & { nominal: SpecimenNominal; position: string; orientation: string; customer_name: string; grade: string };

/**
 * Finds the specimen an id or a code names: digits are an item id; anything else must be a
 * specimen code with a good check character (422 otherwise, saying what is wrong).
 */
async function resolveSpecimen(req: Request, ref: string): Promise<DetailRow> {
  let where: string;
  let value: unknown;
  if (/^\d+$/.test(ref)) {
    where = 'i.id = $1';
    value = ref;
  } else {
    const code = parseCode(ref);
    if (!code.ok) {
      throw new AppError(422, code.reason === 'check' ? 'check_character' : 'invalid_code', code.message, [{ path: 'code', message: code.message }]);
    }
    if (code.kind !== 'specimen') {
      throw unprocessable(`${code.code} is a ${code.kind} code, not a specimen code.`, [{ path: 'code', message: 'Give a specimen code, like S26-00157-W.' }]);
    }
    where = 'i.code = $1';
    value = code.code;
  }
  const [rows] = await req.ctx.sequelize.query(
    `SELECT ${SELECT}, sp.nominal, s.position, s.orientation, c.name AS customer_name, h.grade
       FROM ${FROM} JOIN customers c ON c.id = o.customer_id WHERE ${where}`,
    { bind: [value] },
  );
  const row = (rows as DetailRow[])[0];
  if (!row) throw notFound(`No specimen is registered as ${ref}.`);
  return row;
}

function presentDetail(req: Request, row: DetailRow): SpecimenDetail {
  return {
    ...presentSpecimen(row),
    nominal: row.nominal,
    geometryLabel: getGeometry(row.geometry_key)?.label ?? null,
    position: row.position,
    orientation: row.orientation,
    customerName: row.customer_name,
    grade: row.grade,
    canWrite: canWriteIntake(req.actor),
  };
}

/** GET /api/specimens: search by code (with or without hyphens), heat, order or sample; filters. */
export async function listSpecimens(req: Request, res: Response): Promise<void> {
  const query = parsed(req, SpecimenListQuerySchema, 'query');
  const sql: ListSql = { select: SELECT, from: FROM, where: [], bind: [] };
  if (query.q) {
    sql.bind.push(containsPattern(normalizeCode(query.q)), containsPattern(query.q));
    const [compact, plain] = [sql.bind.length - 1, sql.bind.length];
    sql.where.push(`(replace(i.code, '-', '') ILIKE $${compact} OR h.heat_number ILIKE $${plain} OR o.number ILIKE $${plain} OR s.code ILIKE $${plain})`);
  }
  if (query.orderId) addFilter(sql, 's.order_id = ?', query.orderId);
  if (query.heatId) addFilter(sql, 's.heat_id = ?', query.heatId);
  if (query.sampleId) addFilter(sql, 'sp.sample_id = ?', query.sampleId);
  if (query.state) addFilter(sql, 'i.state = ?', query.state);
  if (query.shape) addFilter(sql, 'sp.shape = ?', query.shape);
  const { rows, total } = await runList<SpecimenRow>(req.ctx.sequelize, sql, orderBySql(query.sort, SORTS, 'sp.serial'), query.page, query.pageSize);
  res.json(presentPage(rows.map(presentSpecimen), total, query, req.actor));
}

/** POST /api/specimens: one specimen cut from a sample, in the order's geometry unless given. */
export async function createSpecimen(req: Request, res: Response): Promise<void> {
  const body = parsed(req, SpecimenCreateSchema);
  const made = await req.ctx.sequelize.transaction(async (transaction) => {
    const [rows] = await req.ctx.sequelize.query(
      `SELECT s.id, s.code, s.heat_id, s.thickness_mm, h.heat_number, o.number AS order_number, o.geometry_key, o.test_standard
         FROM samples s JOIN heats h ON h.id = s.heat_id JOIN orders o ON o.id = s.order_id WHERE s.id = $1`,
      { bind: [body.sampleId], transaction },
    );
    const s = (rows as { id: number; code: string; heat_id: number; thickness_mm: string | null; heat_number: string; order_number: string; geometry_key: string; test_standard: string }[])[0];
    if (!s) throw unprocessable(`No sample has id ${body.sampleId}.`, [{ path: 'sampleId', message: 'Choose the sample this specimen is cut from.' }]);
    return registerSpecimens(
      req.ctx,
      {
        sample: { id: s.id, code: s.code, heatId: s.heat_id, heatNumber: s.heat_number, orderNumber: s.order_number, thicknessMm: s.thickness_mm },
        geometryKey: body.geometryKey ?? s.geometry_key,
        testStandard: body.testStandard ?? s.test_standard,
        count: 1,
        actor: currentUser(req),
      },
      transaction,
    );
  });
  res.status(201).json(presentDetail(req, await resolveSpecimen(req, String(made[0]!.id))));
}

/** GET /api/specimens/:idOrCode */
export async function getSpecimen(req: Request, res: Response): Promise<void> {
  const { idOrCode } = parsed(req, SpecimenRefParamsSchema, 'params');
  res.json(presentDetail(req, await resolveSpecimen(req, idOrCode)));
}

/** PATCH /api/specimens/:idOrCode: geometry and standard, only while the specimen is registered and not yet cut. */
export async function updateSpecimen(req: Request, res: Response): Promise<void> {
  const { idOrCode } = parsed(req, SpecimenRefParamsSchema, 'params');
  const body = parsed(req, SpecimenUpdateSchema);
  const row = await resolveSpecimen(req, idOrCode);
  if (row.state !== 'registered') {
    throw conflict('state_refused', `${row.code} is ${row.state.replace(/_/g, ' ')}; its geometry and standard are fixed once it is cut.`, { state: row.state });
  }
  const geometry = getGeometry(body.geometryKey ?? row.geometry_key)!;
  const [samples] = await req.ctx.sequelize.query(`SELECT thickness_mm FROM samples WHERE id = $1`, { bind: [row.sample_id] });
  const thickness = (samples as { thickness_mm: string | null }[])[0]?.thickness_mm ?? null;
  await req.ctx.sequelize.query(
    `UPDATE specimens SET geometry_key = $2, shape = $3, test_standard = $4, nominal = $5 WHERE item_id = $1`,
    { bind: [row.id, geometry.key, geometry.shape, body.testStandard ?? row.test_standard, JSON.stringify(nominalFor(geometry, thickness))] },
  );
  res.json(presentDetail(req, await resolveSpecimen(req, String(row.id))));
}
