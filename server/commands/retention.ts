/**
 * Retention read from the database: the lab's settings, the rules of each item's order and
 * customer, the holds in force, where each item sits, and the verdict of disposalCheck for it.
 * The due list, the digest and disposal batches all judge items through here.
 */
import { QueryTypes, type Transaction } from 'sequelize';
import {
  disposalCheck,
  type DisposalCheck,
  type EndOfMonthPolicy,
  type LegalHold,
  type RetentionRule,
} from '../../shared/domain/retention';
import type { ItemState, ProjectionState } from '../../shared/domain/ledger/state-machine';
import type { DueItemView, RetentionSettingsView } from '../../shared/schemas/retention';
import type { AppContext } from '../app';

/** The lab's retention settings. */
export interface LabSettings {
  timeZone: string;
  defaultRule: RetentionRule;
  endOfMonth: EndOfMonthPolicy;
  digestDays: number;
  digestHour: number;
  updatedAt: string;
}

interface PeriodColumns {
  days: number | null;
  months: number | null;
  years: number | null;
}

/** A rule from nullable period columns and a basis; null when no period is set. */
export function ruleFromColumns(period: PeriodColumns, basis: string | null): RetentionRule | null {
  if (period.days === null && period.months === null && period.years === null) return null;
  const rule: RetentionRule = { basis: basis === 'test' ? 'test' : 'report' };
  if (period.days !== null) rule.days = period.days;
  if (period.months !== null) rule.months = period.months;
  if (period.years !== null) rule.years = period.years;
  return rule;
}

const iso = (value: Date | string | null): string | null => (value === null ? null : new Date(value).toISOString());

/** Reads the lab's settings row. */
export async function loadLabSettings(ctx: AppContext, transaction?: Transaction): Promise<LabSettings> {
  const [row] = await ctx.sequelize.query<{
    time_zone: string;
    retention_days: number | null;
    retention_months: number | null;
    retention_years: number | null;
    retention_basis: string;
    end_of_month: EndOfMonthPolicy;
    digest_days: number;
    digest_hour: number;
    updated_at: Date;
  }>('SELECT * FROM lab_settings WHERE id', { type: QueryTypes.SELECT, transaction });
  if (!row) throw new Error('lab_settings has no row: run the migrations');
  const defaultRule = ruleFromColumns({ days: row.retention_days, months: row.retention_months, years: row.retention_years }, row.retention_basis);
  return {
    timeZone: row.time_zone,
    defaultRule: defaultRule ?? { days: 0, basis: 'report' },
    endOfMonth: row.end_of_month,
    digestDays: row.digest_days,
    digestHour: row.digest_hour,
    updatedAt: new Date(row.updated_at).toISOString(),
  };
}

/** The settings as GET /api/retention/settings answers. */
export function settingsView(settings: LabSettings): RetentionSettingsView {
  return { ...settings };
}

/** One item with everything a retention verdict and a batch document need. */
export interface RetainedItem {
  id: number;
  code: string;
  kind: 'specimen' | 'half';
  state: ProjectionState;
  heldFrom: ItemState | null;
  containerId: number | null;
  specimenId: number;
  specimen: string | null;
  orderId: number;
  order: string;
  customerId: number;
  customer: string;
  heatId: number;
  heat: string;
  orderRule: RetentionRule | null;
  customerRule: RetentionRule | null;
  reportIssuedAt: string | null;
  testedAt: string | null;
}

interface ItemRow {
  id: string;
  code: string;
  kind: 'specimen' | 'half';
  state: ProjectionState;
  held_from: ItemState | null;
  container_id: string | null;
  specimen_id: string;
  specimen_code: string;
  order_id: number;
  order_number: string;
  o_days: number | null;
  o_months: number | null;
  o_years: number | null;
  o_basis: string;
  report_issued_at: Date | null;
  customer_id: number;
  customer_name: string;
  c_days: number | null;
  c_months: number | null;
  c_years: number | null;
  c_basis: string | null;
  heat_id: number;
  heat_number: string;
  tested_at: Date | null;
}

// The test date is the specimen's last `tested` (or `rejected`, for a piece never tested) event
// still in force: a voided one does not count.
const ITEM_SQL = `
  SELECT i.id, i.code, i.kind, i.state, i.projection->>'heldFrom' AS held_from, i.container_id,
         sp.id AS specimen_id, sp.code AS specimen_code,
         o.id AS order_id, o.number AS order_number, o.retention_days AS o_days, o.retention_months AS o_months,
         o.retention_years AS o_years, o.retention_basis AS o_basis, o.report_issued_at,
         c.id AS customer_id, c.name AS customer_name, c.retention_days AS c_days, c.retention_months AS c_months,
         c.retention_years AS c_years, c.retention_basis AS c_basis,
         h.id AS heat_id, h.heat_number,
         (SELECT max(e.occurred_at) FROM custody_events e
           WHERE e.item_id = sp.id AND e.type IN ('tested','rejected')
             AND NOT EXISTS (SELECT 1 FROM custody_events v WHERE v.item_id = e.item_id AND v.type = 'voided' AND v.corrects_hash = e.hash)
         ) AS tested_at
    FROM items i
    JOIN items sp ON sp.id = CASE WHEN i.kind = 'half' THEN i.parent_item_id ELSE i.id END
    JOIN specimens s ON s.item_id = sp.id
    JOIN samples sa ON sa.id = s.sample_id
    JOIN orders o ON o.id = sa.order_id
    JOIN customers c ON c.id = o.customer_id
    JOIN heats h ON h.id = sa.heat_id
   WHERE i.kind IN ('specimen','half')`;

/** The item states the due list covers: those disposal can follow, and those held from them. */
const RETAINED_STATES = ['retained', 'rejected'];

function itemFromRow(row: ItemRow): RetainedItem {
  return {
    id: Number(row.id),
    code: row.code,
    kind: row.kind,
    state: row.state,
    heldFrom: row.held_from,
    containerId: row.container_id === null ? null : Number(row.container_id),
    specimenId: Number(row.specimen_id),
    specimen: row.kind === 'half' ? row.specimen_code : null,
    orderId: row.order_id,
    order: row.order_number,
    customerId: row.customer_id,
    customer: row.customer_name,
    heatId: row.heat_id,
    heat: row.heat_number,
    orderRule: ruleFromColumns({ days: row.o_days, months: row.o_months, years: row.o_years }, row.o_basis),
    customerRule: ruleFromColumns({ days: row.c_days, months: row.c_months, years: row.c_years }, row.c_basis),
    reportIssuedAt: iso(row.report_issued_at),
    testedAt: iso(row.tested_at),
  };
}

/** Every specimen and half that is retained (or rejected), or held from one of those states. */
export async function loadRetainedItems(ctx: AppContext, transaction?: Transaction): Promise<RetainedItem[]> {
  const rows = await ctx.sequelize.query<ItemRow>(
    `${ITEM_SQL} AND (i.state = ANY($1) OR (i.state = 'held' AND i.projection->>'heldFrom' = ANY($1))) ORDER BY i.id`,
    { bind: [RETAINED_STATES], type: QueryTypes.SELECT, transaction },
  );
  return rows.map(itemFromRow);
}

/**
 * Specimens and halves by code, whatever their state. With `lock`, their item rows are locked
 * for the transaction (in id order, as the ledger locks them), so nothing changes them between
 * the check and the events.
 */
export async function loadItemsByCode(
  ctx: AppContext,
  codes: readonly string[],
  opts: { transaction?: Transaction; lock?: boolean } = {},
): Promise<Map<string, RetainedItem>> {
  if (codes.length === 0) return new Map();
  if (opts.lock && opts.transaction) {
    await ctx.sequelize.query('SELECT id FROM items WHERE code = ANY($1) ORDER BY id FOR UPDATE', {
      bind: [codes],
      transaction: opts.transaction,
    });
  }
  const rows = await ctx.sequelize.query<ItemRow>(`${ITEM_SQL} AND i.code = ANY($1)`, {
    bind: [codes],
    type: QueryTypes.SELECT,
    transaction: opts.transaction,
  });
  return new Map(rows.map((row) => [row.code, itemFromRow(row)]));
}

/** A hold in force, with the ids it names. */
export interface ActiveHold {
  id: number;
  scope: 'order' | 'heat' | 'item';
  orderId: number | null;
  heatId: number | null;
  itemId: number | null;
  ref: string;
  reason: string;
  placedAt: string;
}

/** The columns of a `legal_holds` row that judging an item needs. */
export interface HoldRowCore {
  id: number;
  scope: ActiveHold['scope'];
  order_id: number | null;
  heat_id: number | null;
  item_id: string | null;
  ref: string;
  reason: string;
  placed_at: Date;
}

/** A hold row as the retention checks use it. */
export function activeHoldOf(row: HoldRowCore): ActiveHold {
  return {
    id: row.id,
    scope: row.scope,
    orderId: row.order_id,
    heatId: row.heat_id,
    // items.id is a bigint, which pg returns as text; ids stay far below 2^53.
    itemId: row.item_id === null ? null : Number(row.item_id),
    ref: row.ref,
    reason: row.reason,
    placedAt: new Date(row.placed_at).toISOString(),
  };
}

/** The holds not yet released. */
export async function loadActiveHolds(ctx: AppContext, transaction?: Transaction): Promise<ActiveHold[]> {
  const rows = await ctx.sequelize.query<HoldRowCore>(
    'SELECT id, scope, order_id, heat_id, item_id, ref, reason, placed_at FROM legal_holds WHERE released_at IS NULL ORDER BY id',
    { type: QueryTypes.SELECT, transaction },
  );
  return rows.map(activeHoldOf);
}

/** The holds that cover an item: on its order, its heat, itself, or (for a half) its specimen. */
export function holdsCovering(item: RetainedItem, holds: readonly ActiveHold[]): ActiveHold[] {
  return holds.filter(
    (h) =>
      (h.scope === 'order' && h.orderId === item.orderId) ||
      (h.scope === 'heat' && h.heatId === item.heatId) ||
      (h.scope === 'item' && (h.itemId === item.id || h.itemId === item.specimenId)),
  );
}

/**
 * The verdict for one item now. Holds were matched by id (a heat number alone may repeat
 * across producers), so each is handed to disposalCheck under the name the item carries.
 */
export function judgeItem(item: RetainedItem, holds: readonly ActiveHold[], settings: LabSettings, now: Date): DisposalCheck {
  const covering: LegalHold[] = holdsCovering(item, holds).map((h) => ({
    scope: h.scope,
    ref: h.scope === 'order' ? item.order : h.scope === 'heat' ? item.heat : h.itemId === item.id ? item.code : (item.specimen ?? item.code),
    reason: h.reason,
    // Holds are in force from the moment they are stored; a clock a little behind must not ignore one.
    placedAt: new Date(Math.min(Date.parse(h.placedAt), now.getTime())).toISOString(),
    releasedAt: null,
  }));
  return disposalCheck(
    {
      code: item.code,
      kind: item.kind,
      state: item.state,
      heldFrom: item.heldFrom,
      order: item.order,
      heat: item.heat,
      specimen: item.specimen,
      rules: { order: item.orderRule, customer: item.customerRule, lab: settings.defaultRule },
      reportIssuedAt: item.reportIssuedAt,
      testedAt: item.testedAt,
      holds: covering,
      timeZone: settings.timeZone,
      endOfMonth: settings.endOfMonth,
    },
    now,
  );
}

/** Where each container sits, as "Shelf 1 › Box 3 › Bag 7" (outermost first), by container id. */
export async function containerPaths(ctx: AppContext, transaction?: Transaction): Promise<(containerId: number | null) => string> {
  const rows = await ctx.sequelize.query<{ id: string; code: string; name: string; container_id: string | null }>(
    `SELECT i.id, i.code, c.name, i.container_id FROM items i JOIN containers c ON c.item_id = i.id`,
    { type: QueryTypes.SELECT, transaction },
  );
  const byId = new Map(rows.map((r) => [Number(r.id), r]));
  const memo = new Map<number, string>();
  const pathOf = (id: number, depth = 0): string => {
    const known = memo.get(id);
    if (known !== undefined) return known;
    const row = byId.get(id);
    if (!row) return '';
    const here = `${row.name} (${row.code})`;
    const parent = row.container_id === null || depth > 64 ? '' : pathOf(Number(row.container_id), depth + 1);
    const text = parent ? `${parent} › ${here}` : here;
    memo.set(id, text);
    return text;
  };
  return (containerId) => (containerId === null ? 'not in storage' : pathOf(containerId) || 'not in storage');
}

/** One retained item with its verdict, as the due list and the digest show it. */
export function dueItemView(item: RetainedItem, check: DisposalCheck, holds: readonly ActiveHold[], location: string): DueItemView {
  const dated = check.status === 'may_go' || check.status === 'not_due' ? check : null;
  return {
    code: item.code,
    kind: item.kind,
    state: item.state,
    specimen: item.specimen,
    order: item.order,
    orderId: item.orderId,
    customer: item.customer,
    customerId: item.customerId,
    heat: item.heat,
    location,
    status: check.status,
    message: check.message,
    notBefore: dated?.due?.notBefore ?? null,
    firstDay: dated?.due?.firstDay ?? null,
    rule: dated?.rule ?? null,
    source: dated?.source ?? null,
    holds: holdsCovering(item, holds).map((h) => ({ id: h.id, scope: h.scope, ref: h.ref, reason: h.reason })),
  };
}

/** Every retained item with its verdict at `now`, in the order they were registered. */
export async function judgeRetainedItems(ctx: AppContext, now: Date): Promise<{ settings: LabSettings; items: DueItemView[] }> {
  const [settings, items, holds, where] = await Promise.all([
    loadLabSettings(ctx),
    loadRetainedItems(ctx),
    loadActiveHolds(ctx),
    containerPaths(ctx),
  ]);
  return {
    settings,
    items: items.map((item) => dueItemView(item, judgeItem(item, holds, settings, now), holds, where(item.containerId))),
  };
}
