import type { Request, Response } from 'express';
import { QueryTypes } from 'sequelize';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import {
  DigestRunSchema,
  DueQuerySchema,
  RuleUpdateSchema,
  SettingsUpdateSchema,
  type DueItemView,
  type DueListView,
  type DueQuery,
  type RuleBody,
} from '../../../shared/schemas/retention';
import type { DisposalCheck } from '../../../shared/domain/retention';
import { containerPaths, dueItemView, judgeItem, judgeRetainedItems, loadActiveHolds, loadItemsByCode, loadLabSettings, ruleFromColumns, settingsView } from '../../commands/retention';
import { runRetentionDigest } from '../../jobs/retention-digest';
import { notFound, unprocessable } from '../../errors';
import { codeFromParam } from '../../ledger/items';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { can } from '../../../shared/permissions';

/** GET /api/retention/settings: the lab's time zone, default rule and digest settings. */
export async function getSettings(req: Request, res: Response): Promise<void> {
  res.json(settingsView(await loadLabSettings(req.ctx)));
}

/** PUT /api/retention/settings. */
export async function putSettings(req: Request, res: Response): Promise<void> {
  const body = parsed(req, SettingsUpdateSchema);
  const user = currentUser(req);
  const rule = body.defaultRule;
  await req.ctx.sequelize.query(
    `UPDATE lab_settings SET time_zone = $1, retention_days = $2, retention_months = $3, retention_years = $4, retention_basis = $5,
            end_of_month = $6, digest_days = $7, digest_hour = $8, updated_by = $9, updated_at = now() WHERE id`,
    { bind: [body.timeZone, rule.days ?? null, rule.months ?? null, rule.years ?? null, rule.basis, body.endOfMonth, body.digestDays, body.digestHour, user.id] },
  );
  res.json(settingsView(await loadLabSettings(req.ctx)));
}

function periodBind(rule: RuleBody | null): [number | null, number | null, number | null] {
  return rule === null ? [null, null, null] : [rule.days ?? null, rule.months ?? null, rule.years ?? null];
}

/** PUT /api/retention/customers/:id: the customer's rule, or null for the lab's default. */
export async function putCustomerRule(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const { rule } = parsed(req, RuleUpdateSchema);
  const [rows] = await req.ctx.sequelize.query(
    `UPDATE customers SET retention_days = $2, retention_months = $3, retention_years = $4, retention_basis = $5, updated_at = now()
      WHERE id = $1 RETURNING id, name`,
    { bind: [id, ...periodBind(rule), rule?.basis ?? null] },
  );
  const row = (rows as { id: number; name: string }[])[0];
  if (!row) throw notFound(`No customer has the id ${id}.`);
  res.json({ customerId: row.id, name: row.name, rule });
}

/** PUT /api/retention/orders/:id: the order's rule, or null for the customer's. */
export async function putOrderRule(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const { rule } = parsed(req, RuleUpdateSchema);
  const [rows] = await req.ctx.sequelize.query(
    `UPDATE orders SET retention_days = $2, retention_months = $3, retention_years = $4,
            retention_basis = COALESCE($5, retention_basis), updated_at = now()
      WHERE id = $1 RETURNING id, number`,
    { bind: [id, ...periodBind(rule), rule?.basis ?? null] },
  );
  const row = (rows as { id: number; number: string }[])[0];
  if (!row) throw notFound(`No order has the id ${id}.`);
  res.json({ orderId: row.id, number: row.number, rule });
}

/** GET /api/retention/rules/orders/:id: the rule that applies to an order's items, and where it comes from. */
export async function getOrderRule(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const [row] = await req.ctx.sequelize.query<{
    number: string; o_days: number | null; o_months: number | null; o_years: number | null; o_basis: string;
    c_days: number | null; c_months: number | null; c_years: number | null; c_basis: string | null; customer: string; report_issued_at: Date | null;
  }>(
    `SELECT o.number, o.retention_days AS o_days, o.retention_months AS o_months, o.retention_years AS o_years, o.retention_basis AS o_basis,
            c.retention_days AS c_days, c.retention_months AS c_months, c.retention_years AS c_years, c.retention_basis AS c_basis,
            c.name AS customer, o.report_issued_at
       FROM orders o JOIN customers c ON c.id = o.customer_id WHERE o.id = $1`,
    { bind: [id], type: QueryTypes.SELECT },
  );
  if (!row) throw notFound(`No order has the id ${id}.`);
  const settings = await loadLabSettings(req.ctx);
  const order = ruleFromColumns({ days: row.o_days, months: row.o_months, years: row.o_years }, row.o_basis);
  const customer = ruleFromColumns({ days: row.c_days, months: row.c_months, years: row.c_years }, row.c_basis);
  const applies = order ? { rule: order, source: 'order' } : customer ? { rule: customer, source: 'customer' } : { rule: settings.defaultRule, source: 'lab' };
  res.json({
    order: row.number,
    customer: row.customer,
    reportIssuedAt: row.report_issued_at === null ? null : new Date(row.report_issued_at).toISOString(),
    rules: { order, customer, lab: settings.defaultRule },
    applies,
    timeZone: settings.timeZone,
  });
}

/** GET /api/retention/items/:code: one item's dispose-not-before date and verdict now. */
export async function getItemRetention(req: Request, res: Response): Promise<void> {
  const parsedCode = codeFromParam(String(req.params.code));
  if (parsedCode.kind !== 'specimen' && parsedCode.kind !== 'half') {
    throw unprocessable(`${parsedCode.code} is a ${parsedCode.kind} code; retention applies to specimens and halves.`);
  }
  const [settings, items, holds, where] = await Promise.all([
    loadLabSettings(req.ctx),
    loadItemsByCode(req.ctx, [parsedCode.code]),
    loadActiveHolds(req.ctx),
    containerPaths(req.ctx),
  ]);
  const item = items.get(parsedCode.code);
  if (!item) throw notFound(`No specimen or half has the code ${parsedCode.code}.`);
  const check = judgeItem(item, holds, settings, new Date());
  res.json({ ...dueItemView(item, check, holds, where(item.containerId)), timeZone: settings.timeZone });
}

const STATUS_ORDER: Record<DisposalCheck['status'], number> = { may_go: 0, not_due: 1, held: 2, not_retained: 3 };

function sortValue(item: DueItemView, key: string): string | number {
  switch (key) {
    case 'notBefore':
      // Items with no date yet sort after every dated one.
      return item.notBefore ?? '9999';
    case 'code':
      return item.code;
    case 'order':
      return item.order;
    case 'heat':
      return item.heat;
    case 'customer':
      return item.customer.toLowerCase();
    case 'location':
      return item.location;
    default:
      return STATUS_ORDER[item.status];
  }
}

/** Filters, sorts and pages the judged items as the due list's query asks. */
export function dueListPage(items: readonly DueItemView[], query: DueQuery, now: Date): { page: DueItemView[]; total: number; counts: DueListView['counts'] } {
  const q = query.q?.toLowerCase();
  const horizon = query.within === undefined ? null : new Date(now.getTime() + query.within * 86_400_000).toISOString();
  const matches = items.filter((item) => {
    if (query.order && item.order !== query.order) return false;
    if (query.customerId && item.customerId !== query.customerId) return false;
    if (horizon !== null && (item.notBefore === null || item.notBefore > horizon)) return false;
    if (q && ![item.code, item.specimen ?? '', item.order, item.heat, item.customer, item.location].some((v) => v.toLowerCase().includes(q))) return false;
    return true;
  });
  const counts: DueListView['counts'] = { may_go: 0, not_due: 0, held: 0, not_retained: 0 };
  for (const item of matches) counts[item.status] += 1;
  const filtered = query.status ? matches.filter((item) => item.status === query.status) : matches;
  const key = query.sort.replace(/^-/, '');
  const dir = query.sort.startsWith('-') ? -1 : 1;
  const sorted = [...filtered].sort((a, b) => {
    const x = sortValue(a, key);
    const y = sortValue(b, key);
    const c = x < y ? -1 : x > y ? 1 : 0;
    return c !== 0 ? c * dir : a.code.localeCompare(b.code);
  });
  const start = (query.page - 1) * query.pageSize;
  return { page: sorted.slice(start, start + query.pageSize), total: filtered.length, counts };
}

/** GET /api/retention/due: retained items with their dates and verdicts; filter, sort and page. */
export async function getDue(req: Request, res: Response): Promise<void> {
  const query = parsed(req, DueQuerySchema, 'query');
  const now = new Date();
  const { settings, items } = await judgeRetainedItems(req.ctx, now);
  const { page, total, counts } = dueListPage(items, query, now);
  const body: DueListView = {
    items: page,
    total,
    page: query.page,
    pageSize: query.pageSize,
    canWrite: req.actor?.kind === 'user' && can(req.actor.role, 'disposals.write'),
    timeZone: settings.timeZone,
    now: now.toISOString(),
    counts,
  };
  res.json(body);
}

/** POST /api/retention/digest: sends today's digest now, unless a server already sent it. */
export async function postDigest(req: Request, res: Response): Promise<void> {
  const body = parsed(req, DigestRunSchema);
  res.json(await runRetentionDigest(req.ctx, { now: new Date(), days: body.days }));
}
