import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let manager: SignedInAgent;
let auditor: SignedInAgent;
const heat = (heatNumber: string, producer = 'Invented Mill') => ({ heatNumber, material: 'HSLA steel plate', grade: 'A572 Gr 50', producer, certificateRef: 'CERT-1' });

beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
  auditor = await signedInAs(t, 'auditor');
});
afterAll(() => t.close());

describe('POST /api/heats', () => {
  it('registers a heat', async () => {
    const res = await manager.post('/api/heats', heat('K-1')).expect(201);
    expect(res.body).toMatchObject({ heatNumber: 'K-1', grade: 'A572 Gr 50', orderCount: 0, specimenCount: 0 });
  });

  it('answers 409 for the same number from the same producer, and allows it from another producer', async () => {
    await manager.post('/api/heats', heat('K-2')).expect(201);
    const res = await manager.post('/api/heats', heat('k-2', 'INVENTED MILL')).expect(409);
    expect(res.body.error.message).toContain('already registered');
    await manager.post('/api/heats', heat('K-2', 'Another Invented Mill')).expect(201);
  });

  it('answers 422 beside each missing field', async () => {
    const res = await manager.post('/api/heats', { heatNumber: '' }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['heatNumber', 'material', 'grade', 'producer']));
  });

  it('answers 403 for an auditor', async () => {
    await auditor.post('/api/heats', heat('K-3')).expect(403);
  });
});

describe('GET /api/heats', () => {
  it('searches by number, grade or producer, and filters by order', async () => {
    await manager.post('/api/heats', heat('ZX-900', 'Searchable Works')).expect(201);
    const res = await auditor.get('/api/heats?q=searchable').expect(200);
    expect(res.body.items.map((h: { heatNumber: string }) => h.heatNumber)).toEqual(['ZX-900']);
    const customerId = (await manager.post('/api/customers', { name: 'Heat Filter Co' }).expect(201)).body.id;
    const orderId = (await manager.post('/api/orders', { number: 'HF-1', customerId, poReference: 'P', materialSpec: 'S', geometryKey: 'astm-e8-round-6-4d', testStandard: 'ASTM E8/E8M' }).expect(201)).body.id;
    await manager.post(`/api/orders/${orderId}/heats`, { heat: heat('ON-ORDER') }).expect(201);
    const onOrder = await auditor.get(`/api/heats?orderId=${orderId}`).expect(200);
    expect(onOrder.body.items.map((h: { heatNumber: string }) => h.heatNumber)).toEqual(['ON-ORDER']);
  });
});

describe('GET /api/heats/:id and PATCH /api/heats/:id', () => {
  it('shows the orders the heat is on and changes its certificate', async () => {
    const id = (await manager.post('/api/heats', heat('K-10')).expect(201)).body.id;
    await manager.patch(`/api/heats/${id}`, { certificateRef: 'CERT-2' }).expect(200);
    const res = await auditor.get(`/api/heats/${id}`).expect(200);
    expect(res.body).toMatchObject({ certificateRef: 'CERT-2', orders: [], samples: [], canWrite: false });
    await auditor.get('/api/heats/99999').expect(404);
  });

  it('answers 409 when a change would repeat another heat’s number', async () => {
    await manager.post('/api/heats', heat('K-20')).expect(201);
    const id = (await manager.post('/api/heats', heat('K-21')).expect(201)).body.id;
    await manager.patch(`/api/heats/${id}`, { heatNumber: 'K-20' }).expect(409);
  });
});
