import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCode } from '../../shared/domain/codes';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let clerk: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext();
  clerk = await signedInAs(t, 'clerk');
});
afterAll(async () => t?.close());

describe('POST /api/containers', () => {
  it('registers a container with a checked code and its registered event', async () => {
    const res = await clerk.post('/api/containers', { containerType: 'bin', name: 'Cell 2 bin A', binHalf: 'A' }).expect(201);
    const { container } = res.body;
    expect(parseCode(container.code)).toMatchObject({ ok: true, kind: 'container' });
    expect(container).toMatchObject({ containerType: 'bin', name: 'Cell 2 bin A', binHalf: 'A', state: 'active', contents: 0 });
    const events = await clerk.get(`/api/items/${container.code}/events`).expect(200);
    expect(events.body.events).toEqual([expect.objectContaining({ type: 'registered', seq: 1, payload: { containerType: 'bin', name: 'Cell 2 bin A', binHalf: 'A' } })]);
  });

  it('places a container inside another and answers a repeated key with the same container', async () => {
    const shelf = (await clerk.post('/api/containers', { containerType: 'shelf', name: 'Store shelf 1' }).expect(201)).body.container;
    const body = { containerType: 'box', name: 'Box 1', containerCode: shelf.code, idempotencyKey: 'box-1-key' };
    const box = await clerk.post('/api/containers', body).expect(201);
    expect(box.body.container.location.map((c: { code: string }) => c.code)).toEqual([shelf.code]);
    const again = await clerk.post('/api/containers', body).expect(200);
    expect(again.body.container.code).toBe(box.body.container.code);
    const detail = await clerk.get(`/api/containers/${shelf.code}`).expect(200);
    expect(detail.body.items).toEqual([{ code: box.body.container.code, kind: 'container', state: 'active' }]);
  });

  it('answers 422 for a bad type, a half mark on a non-bin, or an unknown outer container', async () => {
    await clerk.post('/api/containers', { containerType: 'crate', name: 'x' }).expect(422);
    await clerk.post('/api/containers', { containerType: 'bag', name: 'x', binHalf: 'B' }).expect(422);
    const res = await clerk.post('/api/containers', { containerType: 'bag', name: 'x', containerCode: 'C-99999-' + 'Z' }).expect(422);
    expect(res.body.error).toBeDefined();
  });

  it('answers 403 for a role without containers.write', async () => {
    const tech = await signedInAs(t, 'technician');
    await tech.post('/api/containers', { containerType: 'bag', name: 'x' }).expect(403);
  });
});

describe('GET /api/containers', () => {
  it('lists, searches and filters by type', async () => {
    await clerk.post('/api/containers', { containerType: 'cart', name: 'Trolley north' }).expect(201);
    const all = await clerk.get('/api/containers').expect(200);
    expect(all.body.total).toBeGreaterThanOrEqual(4);
    const carts = await clerk.get('/api/containers?type=cart').expect(200);
    expect(carts.body.items.every((c: { containerType: string }) => c.containerType === 'cart')).toBe(true);
    const found = await clerk.get('/api/containers?q=trolley').expect(200);
    expect(found.body.items.map((c: { name: string }) => c.name)).toEqual(['Trolley north']);
    await clerk.get('/api/containers?type=crate').expect(422);
  });

  it('answers 404 for an unknown container code and 422 for a specimen code', async () => {
    await clerk.get('/api/containers/C-99999-' + 'Z').expect((r) => expect([404, 422]).toContain(r.status));
    await clerk.get('/api/containers/S26-00157-W').expect(422);
  });
});
