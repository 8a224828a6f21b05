import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { createUser, signIn, signedInAs, type SignedInAgent } from '../factories';
import { DAY_MS, retainedOrder, type RetainedOrder } from './disposals-fixtures';

let t: TestContext;
let clerk: SignedInAgent;
let actor: LedgerActor;
let past: RetainedOrder;
let soon: RetainedOrder;
let unreported: RetainedOrder;
let leap: RetainedOrder;

beforeAll(async () => {
  t = await createTestContext();
  const user = await createUser(t, 'clerk');
  clerk = await signIn(t, user);
  actor = { kind: 'user', id: user.id, role: 'clerk' };
  past = await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - 100 * DAY_MS), specimens: 1 });
  soon = await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - 25 * DAY_MS), specimens: 1 });
  unreported = await retainedOrder(t, actor, { reportIssuedAt: null, specimens: 1 });
  leap = await retainedOrder(t, actor, { reportIssuedAt: new Date('2024-01-30T12:00:00Z'), retentionDays: null, specimens: 1 });
});
afterAll(async () => t?.close());

describe('PUT /api/retention/settings', () => {
  it('refuses a time zone the server does not know (422 with the field)', async () => {
    const res = await clerk
      .put('/api/retention/settings', { timeZone: 'Mars/Olympus', defaultRule: { days: 90, basis: 'report' }, endOfMonth: 'clamp', digestDays: 14, digestHour: 7 })
      .expect(422);
    expect(res.body.error.details).toEqual([expect.objectContaining({ path: 'timeZone' })]);
  });

  it('keeps the lab’s zone, default rule and digest settings', async () => {
    const res = await clerk
      .put('/api/retention/settings', { timeZone: 'Pacific/Auckland', defaultRule: { months: 6, basis: 'report' }, endOfMonth: 'clamp', digestDays: 10, digestHour: 6 })
      .expect(200);
    expect(res.body).toMatchObject({ timeZone: 'Pacific/Auckland', defaultRule: { months: 6, basis: 'report' }, digestDays: 10, digestHour: 6 });
  });
});

describe('PUT /api/retention/orders/:id and /customers/:id', () => {
  it('sets an order’s rule in months, which then applies before the customer’s and the lab’s', async () => {
    await clerk.put(`/api/retention/customers/${leap.customerId}`, { rule: { years: 2, basis: 'test' } }).expect(200);
    let rule = await clerk.get(`/api/retention/orders/${leap.orderId}`).expect(200);
    expect(rule.body.applies).toEqual({ rule: { years: 2, basis: 'test' }, source: 'customer' });
    await clerk.put(`/api/retention/orders/${leap.orderId}`, { rule: { months: 1, basis: 'report' } }).expect(200);
    rule = await clerk.get(`/api/retention/orders/${leap.orderId}`).expect(200);
    expect(rule.body.applies).toEqual({ rule: { months: 1, basis: 'report' }, source: 'order' });
  });

  it('refuses a rule with no period (422)', async () => {
    const res = await clerk.put(`/api/retention/orders/${leap.orderId}`, { rule: { basis: 'report' } }).expect(422);
    expect(res.body.error.details[0].message).toBe('Give days, months or years.');
  });

  it('answers 404 for an unknown order and 403 for a technician', async () => {
    await clerk.put('/api/retention/orders/999999', { rule: null }).expect(404);
    const tech = await signedInAs(t, 'technician');
    await tech.put(`/api/retention/orders/${leap.orderId}`, { rule: null }).expect(403);
  });
});

describe('GET /api/retention/items/:code', () => {
  it('counts a month from 31 January in the lab’s zone to 29 February of a leap year; the item may go from 1 March, local midnight', async () => {
    // 2024-01-30T12:00Z is 31 January 01:00 in Auckland (NZDT, UTC+13: from memory). date-fns
    // addMonths(2024-01-31, 1) = 2024-02-29 (CHECKS.md, run), so the period ends on the 29th and
    // the first day it may go is 1 March, which starts at 2024-02-29T11:00Z.
    const res = await clerk.get(`/api/retention/items/${leap.halves[0]}`).expect(200);
    expect(res.body).toMatchObject({
      status: 'may_go',
      source: 'order',
      rule: { months: 1, basis: 'report' },
      firstDay: '2024-03-01',
      notBefore: '2024-02-29T11:00:00.000Z',
      timeZone: 'Pacific/Auckland',
    });
  });

  it('says an item whose report is not issued has no date yet', async () => {
    const res = await clerk.get(`/api/retention/items/${unreported.halves[0]}`).expect(200);
    expect(res.body).toMatchObject({ status: 'not_due', notBefore: null });
    expect(res.body.message).toMatch(/the report has not been issued/);
  });

  it('answers 422 for a container code', async () => {
    await clerk.get(`/api/retention/items/${past.bag}`).expect(422);
  });
});

describe('GET /api/retention/due', () => {
  it('lists every retained half with its date and verdict, counts by verdict, and pages on the server', async () => {
    const res = await clerk.get('/api/retention/due?pageSize=10').expect(200);
    expect(res.body.total).toBe(8);
    expect(res.body.items).toHaveLength(8);
    expect(res.body.counts).toEqual({ may_go: 4, not_due: 4, held: 0, not_retained: 0 });
    // Sorted by date, soonest first; undated items last.
    const dates = res.body.items.map((i: { notBefore: string | null }) => i.notBefore);
    expect(dates.slice(-2)).toEqual([null, null]);
    const dated = dates.slice(0, -2) as string[];
    expect([...dated].sort()).toEqual(dated);
    const page2 = await clerk.get('/api/retention/due?pageSize=3&page=2&sort=code').expect(200);
    const all = await clerk.get('/api/retention/due?pageSize=100&sort=code').expect(200);
    expect(page2.body.items.map((i: { code: string }) => i.code)).toEqual(all.body.items.slice(3, 6).map((i: { code: string }) => i.code));
  });

  it('filters by verdict, by order, and by what falls due within N days', async () => {
    const mayGo = await clerk.get('/api/retention/due?status=may_go').expect(200);
    expect(new Set(mayGo.body.items.map((i: { code: string }) => i.code))).toEqual(new Set([...past.halves, ...leap.halves]));
    const byOrder = await clerk.get(`/api/retention/due?order=${encodeURIComponent(soon.order)}`).expect(200);
    expect(byOrder.body.items.map((i: { code: string }) => i.code).sort()).toEqual([...soon.halves].sort());
    // 30 days from a report 25 days ago: due in about 5 days, so within 7 but not within 2.
    const within7 = await clerk.get('/api/retention/due?status=not_due&within=7').expect(200);
    expect(within7.body.items.map((i: { code: string }) => i.code).sort()).toEqual([...soon.halves].sort());
    const within2 = await clerk.get('/api/retention/due?status=not_due&within=2').expect(200);
    expect(within2.body.total).toBe(0);
  });

  it('shows an item under a hold as held, naming the hold', async () => {
    const hold = await clerk.post('/api/holds', { scope: 'item', ref: past.halves[0], reason: 'Photograph the fracture again' }).expect(201);
    const res = await clerk.get('/api/retention/due?status=held').expect(200);
    expect(res.body.items).toEqual([expect.objectContaining({ code: past.halves[0], holds: [expect.objectContaining({ id: hold.body.id, scope: 'item' })] })]);
    const holds = await clerk.get('/api/holds?active=true').expect(200);
    expect(holds.body.items[0]).toMatchObject({ id: hold.body.id, items: 1, ref: past.halves[0] });
  });

  it('refuses a sort key it does not know (422)', async () => {
    const res = await clerk.get('/api/retention/due?sort=colour').expect(422);
    expect(res.body.error.details[0].path).toBe('sort');
  });
});

describe('POST /api/holds', () => {
  it('refuses an order number that does not exist, and a container as an item (422)', async () => {
    await clerk.post('/api/holds', { scope: 'order', ref: 'NO-SUCH-ORDER', reason: 'x' }).expect(422);
    const res = await clerk.post('/api/holds', { scope: 'item', ref: past.bag, reason: 'x' }).expect(422);
    expect(res.body.error.message).toMatch(/container code/);
  });

  it('refuses a hold with no reason (422)', async () => {
    const res = await clerk.post('/api/holds', { scope: 'order', ref: past.order, reason: ' ' }).expect(422);
    expect(res.body.error.details[0].path).toBe('reason');
  });
});
