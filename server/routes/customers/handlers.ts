import type { Request, Response } from 'express';
import { CustomerCreateSchema, CustomerListQuerySchema, CustomerUpdateSchema } from '../../../shared/schemas/customers';
import { conflict, notFound } from '../../errors';
import { parsed } from '../../middleware/validate';
import { addFilter, containsPattern, orderBySql, runList, type ListSql } from '../../models/list-query';
import { presentCustomer, type CustomerRow } from '../../presenters/customer';
import { canWriteIntake, presentPage } from '../../presenters/page';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';

const SELECT = `c.id, c.name, c.contact_email, c.retention_days, c.created_at,
  (SELECT count(*)::int FROM orders o WHERE o.customer_id = c.id) AS order_count`;
const SORTS = { name: 'lower(c.name)', createdAt: 'c.created_at', orders: 'order_count' };

async function loadCustomer(req: Request, id: number): Promise<CustomerRow> {
  const [rows] = await req.ctx.sequelize.query(`SELECT ${SELECT} FROM customers c WHERE c.id = $1`, { bind: [id] });
  const row = (rows as CustomerRow[])[0];
  if (!row) throw notFound(`No customer has id ${id}.`);
  return row;
}

async function assertNameFree(req: Request, name: string, exceptId?: number): Promise<void> {
  const taken = await req.ctx.sequelize.query(`SELECT id FROM customers WHERE lower(name) = lower($1) AND id <> $2`, {
    bind: [name, exceptId ?? 0],
  });
  if ((taken[0] as unknown[]).length > 0) {
    throw conflict('duplicate', `A customer named "${name}" already exists.`, [{ path: 'name', message: 'This name is taken by another customer.' }]);
  }
}

/** GET /api/customers: search by name or e-mail, sorted and paged. */
export async function listCustomers(req: Request, res: Response): Promise<void> {
  const query = parsed(req, CustomerListQuerySchema, 'query');
  const sql: ListSql = { select: SELECT, from: 'customers c', where: [], bind: [] };
  if (query.q) addFilter(sql, "(c.name ILIKE ? OR coalesce(c.contact_email, '') ILIKE ?)", containsPattern(query.q));
  const { rows, total } = await runList<CustomerRow>(req.ctx.sequelize, sql, orderBySql(query.sort, SORTS, 'c.id'), query.page, query.pageSize);
  res.json(presentPage(rows.map(presentCustomer), total, query, req.actor));
}

/** POST /api/customers */
export async function createCustomer(req: Request, res: Response): Promise<void> {
  const body = parsed(req, CustomerCreateSchema);
  await assertNameFree(req, body.name);
  const customer = await req.ctx.models.Customer.create({
    name: body.name,
    contactEmail: body.contactEmail ?? null,
    retentionDays: body.retentionDays ?? null,
  });
  res.status(201).json({ ...presentCustomer(await loadCustomer(req, customer.id)), canWrite: true });
}

/** GET /api/customers/:id */
export async function getCustomer(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  res.json({ ...presentCustomer(await loadCustomer(req, id)), canWrite: canWriteIntake(req.actor) });
}

/** PATCH /api/customers/:id */
export async function updateCustomer(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const body = parsed(req, CustomerUpdateSchema);
  const customer = await req.ctx.models.Customer.findByPk(id);
  if (!customer) throw notFound(`No customer has id ${id}.`);
  if (body.name !== undefined) await assertNameFree(req, body.name, id);
  await customer.update(body);
  res.json({ ...presentCustomer(await loadCustomer(req, id)), canWrite: true });
}
