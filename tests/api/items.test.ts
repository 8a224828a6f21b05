import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { containerCode, specimenCode } from '../../shared/domain/codes';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import { createContainer, createSample, createSpecimen, FLAT_READINGS, managerActor, scan } from '../ledger/ledger-fixtures';

let t: TestContext;
let tech: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext();
  tech = await signedInAs(t, 'technician');
});
afterAll(async () => t?.close());

describe('GET /api/items/:code', () => {
  it('resolves a specimen with its state, what may follow, its order and heat', async () => {
    const actor = await managerActor(t);
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, actor, sampleId);
    const res = await tech.get(`/api/items/${code.toLowerCase().replace(/-/g, '')}`).expect(200);
    expect(res.body).toMatchObject({ kind: 'specimen', code, state: 'registered', lastSeq: 1, allowed: expect.arrayContaining(['cut', 'held']) });
    expect(res.body.specimen).toMatchObject({ geometryKey: 'astm-e8-flat-sheet-12.5', shape: 'flat' });
    expect(res.body.specimen.order).toMatch(/^O-/);
    expect(res.body.halves).toEqual([]);
  });

  it('follows nesting for the location of a half in a bag on a shelf', async () => {
    const actor = await managerActor(t);
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, actor, sampleId);
    const bin = await createContainer(t, actor, 'bin');
    const shelf = await createContainer(t, actor, 'shelf');
    const bag = await createContainer(t, actor, 'bag', { inside: shelf });
    for (const body of [scan('cut', code), scan('measured', code, { payload: FLAT_READINGS }), scan('tested', code, { payload: { fractured: true } })]) {
      await tech.post('/api/events', body).expect(201);
    }
    const half = (await tech.get(`/api/items/${code}`).expect(200)).body.halves[1].code as string;
    await tech.post('/api/events', scan('binned', half, { containerCode: bin })).expect(201);
    await tech.post('/api/events', scan('retained', half, { containerCode: bag })).expect(201);
    const res = await tech.get(`/api/items/${half}`).expect(200);
    expect(res.body).toMatchObject({ kind: 'half', state: 'retained', half: { side: 'B', specimen: code } });
    expect(res.body.location.containers.map((c: { code: string }) => c.code)).toEqual([bag, shelf]);
    const container = await tech.get(`/api/items/${bag}`).expect(200);
    expect(container.body).toMatchObject({ kind: 'container', container: { containerType: 'bag', contents: 1 } });
  });

  it('answers 422 for a wrong check character, 404 for an unknown code, 401 without a caller', async () => {
    const code = specimenCode(26, 4242);
    const wrong = code.slice(0, -1) + (code.endsWith('A') ? 'B' : 'A');
    const bad = await tech.get(`/api/items/${wrong}`).expect(422);
    expect(bad.body.error.message).toMatch(/check character/);
    await tech.get(`/api/items/${code}`).expect(404);
    await tech.get(`/api/items/${containerCode(777)}`).expect(404);
    await request(t.app).get(`/api/items/${code}`).expect(401);
  });
});

describe('GET /api/items/:code/events', () => {
  it('lists the chain in seq order with its check, the cancelled events, and pages', async () => {
    const actor = await managerActor(t);
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, actor, sampleId);
    await tech.post('/api/events', scan('cut', code)).expect(201);
    await tech.post('/api/events', scan('label_printed', code)).expect(201);
    const all = await tech.get(`/api/items/${code}/events`).expect(200);
    expect(all.body.events.map((e: { seq: number }) => e.seq)).toEqual([1, 2, 3]);
    expect(all.body.chain).toMatchObject({ ok: true, eventsChecked: 3 });
    expect(all.body.cancelled).toEqual([]);
    const page = await tech.get(`/api/items/${code}/events?after=1&limit=1`).expect(200);
    expect(page.body).toMatchObject({ more: true, chain: null });
    expect(page.body.events.map((e: { seq: number }) => e.seq)).toEqual([2]);
  });
});
