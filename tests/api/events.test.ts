import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { halfCode } from '../../shared/domain/codes';
import { computeEventHash, GENESIS_HASH } from '../../shared/domain/ledger/event-hash';
import type { TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import {
  countRows,
  createContainer,
  createSample,
  createSpecimen,
  createStation,
  createToken,
  FLAT_READINGS,
  scan,
  startLedgerRig,
} from '../ledger/ledger-fixtures';
import type { LedgerActor } from '../../server/ledger/types';

let t: TestContext;
let tech: SignedInAgent;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  ({ t, tech, actor, sampleId } = await startLedgerRig());
});
afterAll(async () => t?.close());

async function cutSpecimen(): Promise<string> {
  const code = await createSpecimen(t, actor, sampleId);
  await tech.post('/api/events', scan('cut', code)).expect(201);
  return code;
}

describe('POST /api/events', () => {
  it('records an event with 201, chained to the item and hashed over its body', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const res = await tech.post('/api/events', scan('cut', code)).expect(201);
    const { event, item, replayed } = res.body;
    expect(replayed).toBe(false);
    expect(event).toMatchObject({ item: code, seq: 2, type: 'cut', actor: { kind: 'user', id: tech.user.id } });
    const { id: _id, hash, ...body } = event;
    expect(computeEventHash(body)).toBe(hash);
    const [first] = (await t.sequelize.query('SELECT hash FROM custody_events WHERE item_code = $1 AND seq = 1', { bind: [code] }))[0] as { hash: string }[];
    expect(event.prevHash).toBe(first?.hash);
    expect(first?.hash).not.toBe(GENESIS_HASH);
    expect(item).toMatchObject({ code, state: 'cut' });
    expect(item.allowed).toEqual(expect.arrayContaining(['conditioning_started', 'measured']));
  });

  it('answers 200 with the same event when the idempotency key comes again, and records one row', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const body = scan('cut', code);
    const first = await tech.post('/api/events', body).expect(201);
    const second = await tech.post('/api/events', body).expect(200);
    expect(second.body.replayed).toBe(true);
    expect(second.body.event).toEqual(first.body.event);
    expect(await countRows(t, 'custody_events', 'idempotency_key = $1', [body.idempotencyKey])).toBe(1);
  });

  it('answers 200 for a repeated key even when the event could follow again (label printed twice)', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const body = scan('label_printed', code);
    await tech.post('/api/events', body).expect(201);
    const again = await tech.post('/api/events', body).expect(200);
    expect(again.body.event.seq).toBe(2);
    expect(await countRows(t, 'custody_events', 'item_code = $1', [code])).toBe(2);
  });

  it('answers 409 idempotency_conflict when a key is reused for another event', async () => {
    const a = await createSpecimen(t, actor, sampleId);
    const b = await createSpecimen(t, actor, sampleId);
    const body = scan('cut', a);
    await tech.post('/api/events', body).expect(201);
    const res = await tech.post('/api/events', { ...body, itemCode: b }).expect(409);
    expect(res.body.error.code).toBe('idempotency_conflict');
  });

  it('answers 409 state_refused with the state and what may follow, logs the refusal and leaves the ledger alone', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const before = await countRows(t, 'custody_events');
    const body = scan('binned', code);
    const res = await tech.post('/api/events', body).expect(409);
    expect(res.body.error.code).toBe('state_refused');
    expect(res.body.error.details).toMatchObject({ state: 'registered', allowed: expect.arrayContaining(['cut']) });
    expect(res.body.error.message).toContain('registered');
    expect(await countRows(t, 'custody_events')).toBe(before);
    const [refusal] = (await t.owner.query('SELECT * FROM scan_refusals WHERE idempotency_key = $1', { bind: [body.idempotencyKey] }))[0] as {
      code: string;
      actor_user_id: number;
      item_code: string;
    }[];
    expect(refusal).toMatchObject({ code: 'state_refused', actor_user_id: tech.user.id, item_code: code });
  });

  it('answers 422 for a code whose check character is wrong, 404 for an unknown code', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const wrong = code.slice(0, -1) + (code.endsWith('0') ? '1' : '0');
    const bad = await tech.post('/api/events', scan('cut', wrong)).expect(422);
    expect(bad.body.error.message).toMatch(/check character/);
    const res = await tech.post('/api/events', scan('cut', 'S99-99999-' + 'X')).expect((r) => expect([404, 422]).toContain(r.status));
    expect(res.body.error).toBeDefined();
  });

  it('answers 422 for a body that does not fit the schema, naming the fields', async () => {
    const res = await tech.post('/api/events', { type: 'cut' }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['idempotencyKey', 'itemCode', 'occurredAt']));
  });

  it('refuses a device time too far from the server time with a clear message', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const twoDaysAgo = new Date(Date.now() - 49 * 3_600_000).toISOString();
    const res = await tech.post('/api/events', scan('cut', code, { occurredAt: twoDaysAgo })).expect(422);
    expect(res.body.error.code).toBe('clock_skew');
    expect(res.body.error.message).toMatch(/clock/);
    expect(await countRows(t, 'scan_refusals', `code = 'clock_skew' AND item_code = $1`, [code])).toBe(1);
  });

  it('refuses registered and split_from from scans: items are registered elsewhere', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const res = await tech.post('/api/events', scan('registered', code)).expect(422);
    expect(res.body.error.code).toBe('registration_elsewhere');
  });

  it('answers 403 for a role that may not post events', async () => {
    const auditor = await signedInAs(t, 'auditor');
    const code = await createSpecimen(t, actor, sampleId);
    await auditor.post('/api/events', scan('cut', code)).expect(403);
  });
});

describe('POST /api/events with instrument tokens', () => {
  it('records an event at the token station for a type the token may post', async () => {
    const station = await createStation(t, 'CELL-1', 'frame');
    const token = await createToken(t, station.id, ['cut', 'measured']);
    const code = await createSpecimen(t, actor, sampleId);
    const res = await request(t.app).post('/api/events').set('Authorization', `Bearer ${token}`).send(scan('cut', code)).expect(201);
    expect(res.body.event).toMatchObject({ station: 'CELL-1', actor: { kind: 'instrument' } });
  });

  it('answers 403 for a type outside the token list or a station other than its own', async () => {
    const station = await createStation(t, 'CELL-2', 'frame');
    await createStation(t, 'SAW-9', 'saw');
    const token = await createToken(t, station.id, ['measured']);
    const code = await createSpecimen(t, actor, sampleId);
    const typeRes = await request(t.app).post('/api/events').set('Authorization', `Bearer ${token}`).send(scan('cut', code)).expect(403);
    expect(typeRes.body.error.code).toBe('token_type');
    const token2 = await createToken(t, station.id, ['cut']);
    const stationRes = await request(t.app)
      .post('/api/events')
      .set('Authorization', `Bearer ${token2}`)
      .send(scan('cut', code, { stationCode: 'SAW-9' }))
      .expect(403);
    expect(stationRes.body.error.code).toBe('token_station');
    expect(await countRows(t, 'scan_refusals', `code IN ('token_type','token_station') AND item_code = $1`, [code])).toBe(2);
  });
});

describe('POST /api/events measured', () => {
  it('stores the readings with the area under the order policy', async () => {
    // Worked values for these readings (CHECKS.md, computed [run]): least section 24.9148 mm²,
    // min(w)·min(t) 24.8153 mm², mean section 25.0347 mm².
    const readings = { shape: 'flat', width: ['12.52', '12.47', '12.50'], thickness: ['1.99', '2.02', '2.00'] };
    const expected = { 'min-dimensions': '24.8153', 'least-section': '24.9148', 'mean-section': '25.0347' } as const;
    for (const [policy, area] of Object.entries(expected)) {
      const { sampleId: sid } = await createSample(t, { areaPolicy: policy as keyof typeof expected });
      const code = await createSpecimen(t, actor, sid);
      await tech.post('/api/events', scan('cut', code)).expect(201);
      const res = await tech.post('/api/events', scan('measured', code, { payload: readings })).expect(201);
      expect(res.body.event.payload.area).toMatchObject({ policy, mm2: area });
      expect(res.body.flags).toEqual([]);
    }
  });

  it('refuses an out-of-tolerance reading without a reason, and flags it with one', async () => {
    const code = await cutSpecimen();
    // 12.5 ± 0.2 mm is the sheet-type width tolerance (ASTM E8/E8M Fig. 1, as in specimen-geometries.ts).
    const payload = { shape: 'flat', width: ['12.80', '12.52', '12.49'], thickness: ['2.01', '2.00', '2.02'] };
    const res = await tech.post('/api/events', scan('measured', code, { payload })).expect(422);
    expect(res.body.error.code).toBe('out_of_tolerance');
    const ok = await tech
      .post('/api/events', scan('measured', code, { payload: { ...payload, outOfToleranceReason: 'Customer accepts the wide specimen' } }))
      .expect(201);
    expect(ok.body.flags).toEqual(['out_of_tolerance']);
    expect(ok.body.event.payload.outOfTolerance[0]).toMatchObject({ dimension: 'width', index: 0, status: 'above' });
  });

  it('refuses readings of the wrong shape or count', async () => {
    const code = await cutSpecimen();
    await tech.post('/api/events', scan('measured', code, { payload: { shape: 'round', diameter: ['6', '6', '6'] } })).expect(422);
    await tech.post('/api/events', scan('measured', code, { payload: { shape: 'flat', width: ['12.5'], thickness: ['2'] } })).expect(422);
  });
});

describe('POST /api/events tested, binned, retained, moved', () => {
  async function measuredSpecimen(): Promise<string> {
    const code = await cutSpecimen();
    await tech.post('/api/events', scan('measured', code, { payload: FLAT_READINGS })).expect(201);
    return code;
  }

  it('creates half A and half B on fracture, each chain starting with split_from linked to the test', async () => {
    const code = await measuredSpecimen();
    const res = await tech.post('/api/events', scan('tested', code, { payload: { fractured: true, maxForceN: 11250 } })).expect(201);
    expect(res.body.item.state).toBe('broken');
    expect(res.body.halves).toEqual([halfCode(code, 'A'), halfCode(code, 'B')]);
    for (const [side, half] of [['A', res.body.halves[0]], ['B', res.body.halves[1]]] as const) {
      const events = await tech.get(`/api/items/${half}/events`).expect(200);
      expect(events.body.events[0]).toMatchObject({ seq: 1, type: 'split_from', prevHash: GENESIS_HASH, payload: { from: code, half: side, fromEvent: res.body.event.hash } });
      expect(events.body.chain.ok).toBe(true);
      const item = await tech.get(`/api/items/${half}`).expect(200);
      expect(item.body).toMatchObject({ kind: 'half', state: 'tested', half: { side, specimen: code } });
    }
  });

  it('keeps an unbroken specimen whole', async () => {
    const code = await measuredSpecimen();
    const res = await tech.post('/api/events', scan('tested', code, { payload: { fractured: false } })).expect(201);
    expect(res.body.item.state).toBe('tested');
    expect(res.body.halves).toEqual([]);
  });

  it('bins into a bin only, the right half into a marked bin, and retains into storage only', async () => {
    const code = await measuredSpecimen();
    const res = await tech.post('/api/events', scan('tested', code, { payload: { fractured: true } })).expect(201);
    const [halfA, halfB] = res.body.halves as string[];
    const bag = await createContainer(t, actor, 'bag');
    const binA = await createContainer(t, actor, 'bin', { binHalf: 'A' });
    const binB = await createContainer(t, actor, 'bin', { binHalf: 'B' });
    const noContainer = await tech.post('/api/events', scan('binned', halfA)).expect(422);
    expect(noContainer.body.error.details).toEqual(expect.arrayContaining([expect.objectContaining({ path: 'container' })]));
    const notBin = await tech.post('/api/events', scan('binned', halfA, { containerCode: bag })).expect(422);
    expect(notBin.body.error.code).toBe('container_mismatch');
    await tech.post('/api/events', scan('binned', halfA, { containerCode: binB })).expect(422);
    await tech.post('/api/events', scan('binned', halfA, { containerCode: binA })).expect(201);
    await tech.post('/api/events', scan('binned', halfB, { containerCode: binB })).expect(201);
    await tech.post('/api/events', scan('retained', halfA, { containerCode: binB })).expect(422);
    await tech.post('/api/events', scan('retained', halfA, { containerCode: bag })).expect(201);
    const item = await tech.get(`/api/items/${halfA}`).expect(200);
    expect(item.body.state).toBe('retained');
    expect(item.body.location.containers.map((c: { code: string }) => c.code)).toEqual([bag]);
  });

  it('moves everything in a container when the container moves', async () => {
    const code = await measuredSpecimen();
    const res = await tech.post('/api/events', scan('tested', code, { payload: { fractured: true } })).expect(201);
    const [halfA] = res.body.halves as string[];
    const bin = await createContainer(t, actor, 'bin');
    const bag = await createContainer(t, actor, 'bag');
    const shelf1 = await createContainer(t, actor, 'shelf');
    const shelf2 = await createContainer(t, actor, 'shelf');
    await tech.post('/api/events', scan('binned', halfA, { containerCode: bin })).expect(201);
    await tech.post('/api/events', scan('retained', halfA, { containerCode: bag })).expect(201);
    await tech.post('/api/events', scan('moved', bag, { containerCode: shelf1 })).expect(201);
    const before = await tech.get(`/api/items/${halfA}`).expect(200);
    expect(before.body.location.containers.map((c: { code: string }) => c.code)).toEqual([bag, shelf1]);
    const halfEventsBefore = await countRows(t, 'custody_events', 'item_code = $1', [halfA]);
    await tech.post('/api/events', scan('moved', bag, { containerCode: shelf2 })).expect(201);
    const after = await tech.get(`/api/items/${halfA}`).expect(200);
    expect(after.body.location.containers.map((c: { code: string }) => c.code)).toEqual([bag, shelf2]);
    // The half's own chain is untouched: its location derives from the bag's.
    expect(await countRows(t, 'custody_events', 'item_code = $1', [halfA])).toBe(halfEventsBefore);
    const cycle = await tech.post('/api/events', scan('moved', shelf2, { containerCode: bag })).expect(422);
    expect(cycle.body.error.code).toBe('container_cycle');
  });
});

describe('POST /api/events/batch', () => {
  it('judges each event alone and in order, with a status per event', async () => {
    const a = await createSpecimen(t, actor, sampleId);
    const b = await createSpecimen(t, actor, sampleId);
    const repeated = scan('cut', b);
    const res = await tech
      .post('/api/events/batch', {
        events: [scan('cut', a), scan('cut', a), repeated, repeated, scan('conditioning_started', a), { type: 'cut' }, scan('voided', a)],
      })
      .expect(200);
    expect(res.body.results.map((r: { status: number }) => r.status)).toEqual([201, 409, 201, 200, 201, 422, 422]);
    expect(res.body).toMatchObject({ recorded: 3, replayed: 1, refused: 3 });
    expect(res.body.results[1].error.code).toBe('state_refused');
    expect(res.body.results[3].event.hash).toBe(res.body.results[2].event.hash);
    const events = await tech.get(`/api/items/${a}/events`).expect(200);
    expect(events.body.events.map((e: { type: string }) => e.type)).toEqual(['registered', 'cut', 'conditioning_started']);
    expect(await countRows(t, 'scan_refusals', 'item_code = $1', [a])).toBeGreaterThanOrEqual(2);
  });

  it('handles a fracture and the halves binned in the same batch', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const bin = await createContainer(t, actor, 'bin');
    const res = await tech
      .post('/api/events/batch', {
        events: [
          scan('cut', code),
          scan('measured', code, { payload: FLAT_READINGS }),
          scan('tested', code, { payload: { fractured: true } }),
          scan('binned', halfCode(code, 'A'), { containerCode: bin }),
          scan('binned', halfCode(code, 'B'), { containerCode: bin }),
        ],
      })
      .expect(200);
    expect(res.body.results.map((r: { status: number }) => r.status)).toEqual([201, 201, 201, 201, 201]);
    const verify = await (await signedInAs(t, 'auditor')).get('/api/ledger/verify').expect(200);
    expect(verify.body.ok).toBe(true);
  });

  it('refuses more than 500 events with 422', async () => {
    const events = Array.from({ length: 501 }, () => scan('cut', 'S26-00001-X'));
    await tech.post('/api/events/batch', { events }).expect(422);
  });
});
