import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { halfCode } from '../../shared/domain/codes';
import type { StoreNode } from '../../shared/schemas/retention';
import { recordEvent } from '../../server/commands/record-event';
import type { LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { createUser, signIn, type SignedInAgent } from '../factories';
import { createContainer, createSample, createSpecimen, FLAT_READINGS, scan } from '../ledger/ledger-fixtures';

let t: TestContext;
let clerk: SignedInAgent;
let actor: LedgerActor;
let halves: string[];
let places: { bin: string; bag: string; box: string; shelf1: string; shelf2: string };

beforeAll(async () => {
  t = await createTestContext();
  const user = await createUser(t, 'clerk');
  clerk = await signIn(t, user);
  actor = { kind: 'user', id: user.id, role: 'clerk' };
  places = {
    bin: await createContainer(t, actor, 'bin'),
    bag: await createContainer(t, actor, 'bag'),
    box: await createContainer(t, actor, 'box'),
    shelf1: await createContainer(t, actor, 'shelf'),
    shelf2: await createContainer(t, actor, 'shelf'),
  };
  const { sampleId } = await createSample(t);
  const code = await createSpecimen(t, actor, sampleId);
  await recordEvent(t.ctx, scan('cut', code), { actor });
  await recordEvent(t.ctx, scan('measured', code, { payload: FLAT_READINGS }), { actor });
  await recordEvent(t.ctx, scan('tested', code, { payload: { fractured: true } }), { actor });
  halves = [halfCode(code, 'A'), halfCode(code, 'B')];
  await recordEvent(t.ctx, scan('binned', halves[0] as string, { containerCode: places.bin }), { actor });
});
afterAll(async () => t?.close());

function find(nodes: StoreNode[], code: string): StoreNode | undefined {
  for (const n of nodes) {
    if (n.code === code) return n;
    const inner = find(n.children, code);
    if (inner) return inner;
  }
  return undefined;
}

describe('POST /api/store/put-away', () => {
  it('retains a binned half into a bag, refuses a half that never reached a bin, and says why', async () => {
    const res = await clerk.post('/api/store/put-away', { into: places.bag, codes: [halves[0], halves[1]] }).expect(200);
    expect(res.body.outcomes).toEqual([
      expect.objectContaining({ code: halves[0], ok: true, type: 'retained' }),
      expect.objectContaining({ code: halves[1], ok: false, type: null }),
    ]);
    expect(res.body.outcomes[1].message).toMatch(/is tested; next may be/);
  });

  it('moves the bag into the box and the box onto a shelf; the tree shows shelf › box › bag › half', async () => {
    await clerk.post('/api/store/put-away', { into: places.box, codes: [places.bag] }).expect(200);
    await clerk.post('/api/store/put-away', { into: places.shelf1, codes: [places.box] }).expect(200);
    const tree = await clerk.get('/api/store/tree').expect(200);
    const shelf = find(tree.body.roots, places.shelf1);
    expect(shelf).toMatchObject({ containerType: 'shelf', total: 1 });
    expect(shelf?.children[0]).toMatchObject({ code: places.box, containerType: 'box' });
    expect(shelf?.children[0]?.children[0]).toMatchObject({ code: places.bag, items: [expect.objectContaining({ code: halves[0], state: 'retained' })] });
  });

  it('moves everything in a box when the box moves to another shelf', async () => {
    const res = await clerk.post('/api/store/put-away', { into: places.shelf2, codes: [places.box] }).expect(200);
    expect(res.body.outcomes[0]).toMatchObject({ ok: true, type: 'moved' });
    const item = await clerk.get(`/api/items/${halves[0]}`).expect(200);
    expect(item.body.location.containers.map((c: { code: string }) => c.code)).toEqual([places.bag, places.box, places.shelf2]);
    const tree = await clerk.get('/api/store/tree').expect(200);
    expect(find(tree.body.roots, places.shelf1)?.total).toBe(0);
    expect(find(tree.body.roots, places.shelf2)?.total).toBe(1);
  });

  it('refuses a shelf inside the box it holds (a cycle), and a non-container as the place (422)', async () => {
    const cycle = await clerk.post('/api/store/put-away', { into: places.box, codes: [places.shelf2] }).expect(200);
    expect(cycle.body.outcomes[0]).toMatchObject({ ok: false });
    expect(cycle.body.outcomes[0].message).toMatch(/inside/);
    const res = await clerk.post('/api/store/put-away', { into: halves[1], codes: [halves[0]] }).expect(422);
    expect(res.body.error.message).toMatch(/scan the bag, box or shelf first/);
  });
});
