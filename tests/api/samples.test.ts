import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let machinist: SignedInAgent;
let clerk: SignedInAgent;
let orderId: number;
let heatId: number;
let otherHeatId: number;

beforeAll(async () => {
  t = await createTestContext();
  machinist = await signedInAs(t, 'machinist');
  clerk = await signedInAs(t, 'clerk');
  const customerId = (await machinist.post('/api/customers', { name: 'Sample Test Works' }).expect(201)).body.id;
  orderId = (await machinist.post('/api/orders', { number: 'SM-1', customerId, poReference: 'P-9', materialSpec: 'ASTM A36', geometryKey: 'astm-e8-flat-sheet-12.5', testStandard: 'ASTM E8/E8M' }).expect(201)).body.id;
  heatId = (await machinist.post(`/api/orders/${orderId}/heats`, { heat: { heatNumber: 'SH-1', material: 'Plate', grade: 'A36', producer: 'Invented Mill' } }).expect(201)).body.id;
  otherHeatId = (await machinist.post('/api/heats', { heatNumber: 'SH-2', material: 'Plate', grade: 'A36', producer: 'Invented Mill' }).expect(201)).body.id;
});
afterAll(() => t.close());

describe('POST /api/samples', () => {
  it('registers a sample with a code of its own', async () => {
    const res = await machinist.post('/api/samples', { orderId, heatId, position: 'head end, mid-width', orientation: 'transverse', thicknessMm: '6.35' }).expect(201);
    expect(res.body).toMatchObject({ orderNumber: 'SM-1', heatNumber: 'SH-1', orientation: 'transverse', thicknessMm: '6.350', specimenCount: 0 });
    expect(res.body.code).toMatch(/^P\d{2}-\d{5}$/);
  });

  it('answers 422 for a heat that is not on the order, and writes nothing', async () => {
    const res = await machinist.post('/api/samples', { orderId, heatId: otherHeatId, position: 'tail', orientation: 'longitudinal' }).expect(422);
    expect(res.body.error.message).toContain('not on the order');
    const list = await clerk.get(`/api/samples?heatId=${otherHeatId}`).expect(200);
    expect(list.body.total).toBe(0);
  });

  it('answers 422 beside missing fields and a thickness that is not a number', async () => {
    const res = await machinist.post('/api/samples', { orderId, thicknessMm: 'thick' }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['heatId', 'position', 'orientation', 'thicknessMm']));
  });

  it('answers 403 for a clerk', async () => {
    await clerk.post('/api/samples', { orderId, heatId, position: 'x', orientation: 'y' }).expect(403);
  });
});

describe('GET /api/samples, GET /api/samples/:id and PATCH /api/samples/:id', () => {
  it('lists by order, reads one with its specimens, and changes its position', async () => {
    const id = (await machinist.post('/api/samples', { orderId, heatId, position: 'tail end', orientation: 'longitudinal' }).expect(201)).body.id;
    await machinist.post('/api/specimens', { sampleId: id }).expect(201);
    const list = await clerk.get(`/api/samples?orderId=${orderId}&q=tail&sort=-createdAt`).expect(200);
    expect(list.body.items.map((s: { id: number }) => s.id)).toEqual([id]);
    await machinist.patch(`/api/samples/${id}`, { position: 'tail end, edge' }).expect(200);
    const res = await clerk.get(`/api/samples/${id}`).expect(200);
    expect(res.body).toMatchObject({ position: 'tail end, edge', customerName: 'Sample Test Works', specimenCount: 1 });
    expect(res.body.specimens[0]).toMatchObject({ state: 'registered', shape: 'flat' });
    await clerk.get('/api/samples/99999').expect(404);
  });
});
