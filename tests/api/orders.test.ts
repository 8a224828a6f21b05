import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let machinist: SignedInAgent;
let technician: SignedInAgent;
let customerId: number;

const order = (number: string, over: Record<string, unknown> = {}) => ({
  number,
  customerId,
  poReference: 'PO-1001',
  materialSpec: 'ASTM A36',
  geometryKey: 'astm-e8-flat-sheet-12.5',
  testStandard: 'ASTM E8/E8M',
  ...over,
});
const heat = (heatNumber: string) => ({ heatNumber, material: 'Carbon steel plate', grade: 'A36', producer: 'Invented Mill' });

beforeAll(async () => {
  t = await createTestContext();
  machinist = await signedInAs(t, 'machinist');
  technician = await signedInAs(t, 'technician');
  customerId = (await machinist.post('/api/customers', { name: 'Quarrendon Fabrication' }).expect(201)).body.id;
});
afterAll(() => t.close());

describe('POST /api/orders', () => {
  it('creates an order with its defaults and existing heats', async () => {
    const h1 = (await machinist.post('/api/heats', heat('T-100')).expect(201)).body.id;
    const res = await machinist.post('/api/orders', order('QF-001', { heatIds: [h1], dueDate: '2026-12-20' })).expect(201);
    expect(res.body).toMatchObject({
      number: 'QF-001',
      customerName: 'Quarrendon Fabrication',
      testsRequested: ['tensile'],
      specimensPerHeat: 2,
      areaPolicy: 'min-dimensions',
      status: 'open',
      dueDate: '2026-12-20',
      heatCount: 1,
    });
  });

  it('answers 422 when the same heat is listed twice, and writes nothing', async () => {
    const h = (await machinist.post('/api/heats', heat('T-101')).expect(201)).body.id;
    const res = await machinist.post('/api/orders', order('QF-002', { heatIds: [h, h] })).expect(422);
    expect(res.body.error.details[0]).toMatchObject({ path: 'heatIds', message: expect.stringContaining('listed twice') });
    await machinist.get('/api/orders?q=QF-002').expect(200).then((r) => expect(r.body.total).toBe(0));
  });

  it('answers 422 beside the fields for an unknown geometry and a bad date', async () => {
    const res = await machinist.post('/api/orders', order('QF-003', { geometryKey: 'no-such', dueDate: '20/12/2026' })).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['geometryKey', 'dueDate']));
  });

  it('answers 409 for an order number already used', async () => {
    await machinist.post('/api/orders', order('QF-004')).expect(201);
    const res = await machinist.post('/api/orders', order('qf-004')).expect(409);
    expect(res.body.error.details[0].path).toBe('number');
  });

  it('answers 422 for a customer that does not exist', async () => {
    const res = await machinist.post('/api/orders', order('QF-005', { customerId: 99999 })).expect(422);
    expect(res.body.error.details[0].path).toBe('customerId');
  });

  it('answers 403 for a technician, who may not write intake', async () => {
    await technician.post('/api/orders', order('QF-006')).expect(403);
  });
});

describe('POST /api/orders/:id/heats', () => {
  it('adds an existing heat and a new one, then answers 409 for a heat already on the order', async () => {
    const id = (await machinist.post('/api/orders', order('QF-010')).expect(201)).body.id;
    const existing = (await machinist.post('/api/heats', heat('T-110')).expect(201)).body.id;
    await machinist.post(`/api/orders/${id}/heats`, { heatId: existing }).expect(201);
    const made = await machinist.post(`/api/orders/${id}/heats`, { heat: heat('T-111') }).expect(201);
    expect(made.body).toMatchObject({ heatNumber: 'T-111', orderCount: 1 });
    const twice = await machinist.post(`/api/orders/${id}/heats`, { heatId: existing }).expect(409);
    expect(twice.body.error).toMatchObject({ code: 'heat_already_on_order', message: expect.stringContaining('T-110 (Invented Mill) is already on order QF-010') });
    const detail = await technician.get(`/api/orders/${id}`).expect(200);
    expect(detail.body.heats.map((h: { heatNumber: string }) => h.heatNumber)).toEqual(['T-110', 'T-111']);
    expect(detail.body.canWrite).toBe(false);
  });

  it('answers 422 when neither a heat id nor a new heat is sent, and beside a new heat’s missing fields', async () => {
    const id = (await machinist.post('/api/orders', order('QF-011')).expect(201)).body.id;
    await machinist.post(`/api/orders/${id}/heats`, {}).expect(422);
    const res = await machinist.post(`/api/orders/${id}/heats`, { heat: { heatNumber: 'X' } }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['heat.material', 'heat.grade', 'heat.producer']));
  });

  it('answers 404 for an order that does not exist', async () => {
    await machinist.post('/api/orders/99999/heats', { heat: heat('T-112') }).expect(404);
  });
});

describe('GET /api/orders', () => {
  it('filters by status and customer, sorts by due date and pages', async () => {
    const other = (await machinist.post('/api/customers', { name: 'Rookwith Alloys' }).expect(201)).body.id;
    await machinist.post('/api/orders', order('RA-1', { customerId: other, dueDate: '2026-12-03' })).expect(201);
    await machinist.post('/api/orders', order('RA-2', { customerId: other, dueDate: '2026-12-01' })).expect(201);
    const closed = (await machinist.post('/api/orders', order('RA-3', { customerId: other, dueDate: '2026-12-02' })).expect(201)).body.id;
    await machinist.patch(`/api/orders/${closed}`, { status: 'closed' }).expect(200);
    const open = await technician.get(`/api/orders?customerId=${other}&status=open&sort=dueDate`).expect(200);
    expect(open.body.items.map((o: { number: string }) => o.number)).toEqual(['RA-2', 'RA-1']);
    const all = await technician.get(`/api/orders?customerId=${other}&sort=-dueDate&pageSize=2&page=1`).expect(200);
    expect(all.body).toMatchObject({ total: 3, pageSize: 2 });
    expect(all.body.items.map((o: { number: string }) => o.number)).toEqual(['RA-1', 'RA-3']);
    await technician.get('/api/orders?status=lost').expect(422);
  });
});

describe('PATCH /api/orders/:id', () => {
  it('changes what may change and refuses an unknown status', async () => {
    const id = (await machinist.post('/api/orders', order('QF-020')).expect(201)).body.id;
    const res = await machinist.patch(`/api/orders/${id}`, { specimensPerHeat: '4', status: 'in_test', retentionDays: '' }).expect(200);
    expect(res.body).toMatchObject({ specimensPerHeat: 4, status: 'in_test', retentionDays: null });
    await machinist.patch(`/api/orders/${id}`, { status: 'finished' }).expect(422);
    await machinist.patch('/api/orders/99999', { status: 'open' }).expect(404);
  });
});
