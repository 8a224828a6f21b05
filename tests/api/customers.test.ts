import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let manager: SignedInAgent;
let auditor: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
  auditor = await signedInAs(t, 'auditor');
});
afterAll(() => t.close());

describe('POST /api/customers', () => {
  it('creates a customer and answers 201 with it', async () => {
    const res = await manager.post('/api/customers', { name: 'Fernwick Forgings', contactEmail: 'QA@fernwick.example', retentionDays: '365' }).expect(201);
    expect(res.body).toMatchObject({ name: 'Fernwick Forgings', contactEmail: 'qa@fernwick.example', retentionDays: 365, orderCount: 0 });
  });

  it('answers 422 with field errors for an empty name and a bad e-mail', async () => {
    const res = await manager.post('/api/customers', { name: '  ', contactEmail: 'not-an-address' }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['name', 'contactEmail']));
  });

  it('answers 409 for a name already used, whatever its case', async () => {
    await manager.post('/api/customers', { name: 'Gullane Castings' }).expect(201);
    const res = await manager.post('/api/customers', { name: 'gullane castings' }).expect(409);
    expect(res.body.error.message).toContain('already exists');
    expect(res.body.error.details[0].path).toBe('name');
  });

  it('answers 403 for a role that may only read', async () => {
    const res = await auditor.post('/api/customers', { name: 'Never Made Ltd' }).expect(403);
    expect(res.body.error.code).toBe('forbidden');
  });
});

describe('GET /api/customers', () => {
  it('searches, sorts and pages on the server', async () => {
    for (const name of ['Alder Rolling', 'Birch Tube', 'Alder Wire']) await manager.post('/api/customers', { name }).expect(201);
    const res = await auditor.get('/api/customers?q=alder&sort=-name&pageSize=1&page=2').expect(200);
    expect(res.body).toMatchObject({ total: 2, page: 2, pageSize: 1, canWrite: false });
    expect(res.body.items.map((c: { name: string }) => c.name)).toEqual(['Alder Rolling']);
  });

  it('answers 422 for a sort key it does not know', async () => {
    const res = await auditor.get('/api/customers?sort=password').expect(422);
    expect(res.body.error.details[0].path).toBe('sort');
  });

  it('answers 401 without a session', async () => {
    const { default: request } = await import('supertest');
    await request(t.app).get('/api/customers').expect(401);
  });
});

describe('GET /api/customers/:id and PATCH /api/customers/:id', () => {
  it('reads and changes a customer', async () => {
    const created = await manager.post('/api/customers', { name: 'Hollin Plate' }).expect(201);
    const id = created.body.id as number;
    await manager.patch(`/api/customers/${id}`, { retentionDays: 90, contactEmail: '' }).expect(200);
    const res = await auditor.get(`/api/customers/${id}`).expect(200);
    expect(res.body).toMatchObject({ id, name: 'Hollin Plate', retentionDays: 90, contactEmail: null, canWrite: false });
  });

  it('answers 404 for an unknown id and 422 for an id that is not a number', async () => {
    await auditor.get('/api/customers/99999').expect(404);
    await auditor.get('/api/customers/abc').expect(422);
  });
});
