import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordEvent } from '../../server/commands/record-event';
import type { TraceView } from '../../shared/schemas/trace';
import type { SignedInAgent } from '../factories';
import type { TestContext } from '../support';
import { createSample, createSpecimen } from '../ledger/ledger-fixtures';
import { startTraceRig, type Life } from './trace-fixtures';

let t: TestContext;
let auditor: SignedInAgent;
let life: Life;

beforeAll(async () => {
  ({ t, auditor, life } = await startTraceRig());
});
afterAll(async () => t?.close());

describe('GET /api/items/:code/trace', () => {
  it('traces a half back to its specimen, sample, heat and order, and says where it sits now', async () => {
    const res = await auditor.get(`/api/items/${life.halfA}/trace`).expect(200);
    const trace = res.body as TraceView;
    expect(trace.item).toMatchObject({ code: life.halfA, kind: 'half', state: 'retained' });
    expect(trace.genealogy.order).toMatchObject({ id: life.orderId, number: life.orderNumber, poReference: life.poReference });
    expect(trace.genealogy.heat?.heatNumber).toBe(life.heatNumber);
    expect(trace.genealogy.sample?.code).toBe(life.sampleCode);
    expect(trace.genealogy.specimen).toMatchObject({ code: life.specimen, state: 'broken' });
    expect(trace.genealogy.halves.map((h) => h.code)).toEqual([life.halfA, life.halfB]);
    // The bag sits on the shelf: innermost first.
    expect(trace.genealogy.containers.map((c) => c.code)).toEqual([life.bag, life.shelf]);
    expect(trace.location.text).toContain(life.bag);
    expect(trace.location.station?.code).toBe(life.stations.store);
  });

  it('lists every event of the half and of its specimen in server order, with who, where, both times and payload', async () => {
    const trace = (await auditor.get(`/api/items/${life.halfA}/trace`).expect(200)).body as TraceView;
    const steps = trace.events.map((e) => `${e.item === life.specimen ? 'S' : 'A'}:${e.type}`);
    expect(steps).toEqual(['S:registered', 'S:cut', 'S:measured', 'S:tested', 'A:split_from', 'A:binned', 'A:retained']);
    const measured = trace.events.find((e) => e.type === 'measured');
    expect(measured?.payload).toMatchObject({ width: FLAT_WIDTHS, area: expect.objectContaining({ mm2: expect.any(String) }) });
    expect(measured).toMatchObject({ station: life.stations.gauge, stationName: `Station ${life.stations.gauge}` });
    expect(measured?.actor).toMatchObject({ kind: 'user', role: 'manager', name: expect.stringContaining('Test manager') });
    for (const e of trace.events) {
      expect(e.occurredAt).toMatch(/Z$/);
      expect(e.recordedAt).toMatch(/Z$/);
      expect(e.hash).toMatch(/^[0-9a-f]{64}$/);
    }
    const tested = trace.events.find((e) => e.type === 'tested');
    expect(tested?.payload).toMatchObject({ fractured: true, maxForceN: 11250 });
  });

  it('reports each chain verified: the half and its specimen', async () => {
    const trace = (await auditor.get(`/api/items/${life.halfA}/trace`).expect(200)).body as TraceView;
    expect(trace.chainOk).toBe(true);
    expect(trace.chains.map((c) => [c.item, c.role, c.ok])).toEqual([
      [life.specimen, 'specimen', true],
      [life.halfA, 'self', true],
    ]);
    expect(trace.chains[1]?.headSeq).toBe(3);
    expect(Date.parse(trace.verifiedAt)).toBeGreaterThan(Date.now() - 60_000);
  });

  it('on a specimen, covers the specimen and both halves', async () => {
    const trace = (await auditor.get(`/api/items/${life.specimen}/trace`).expect(200)).body as TraceView;
    expect(trace.chains.map((c) => c.item)).toEqual([life.specimen, life.halfA, life.halfB]);
    expect(trace.events.filter((e) => e.type === 'split_from')).toHaveLength(2);
  });

  it('keeps a voided measurement in the timeline, marked cancelled, with the void\'s signature, and finds no missing step', async () => {
    const { sampleId } = await createSample(t);
    const code = await createSpecimen(t, life.actor, sampleId);
    const at = (m: number) => new Date(Date.now() - 30 * 60_000 + m * 60_000).toISOString();
    await recordEvent(t.ctx, { idempotencyKey: randomUUID(), type: 'cut', itemCode: code, occurredAt: at(1) }, { actor: life.actor });
    await recordEvent(t.ctx, { idempotencyKey: randomUUID(), type: 'measured', itemCode: code, occurredAt: at(2), payload: FLAT }, { actor: life.actor });
    // Void the measurement: the test then stands on no measurement in force.
    await recordEvent(
      t.ctx,
      { idempotencyKey: randomUUID(), type: 'voided', itemCode: code, occurredAt: at(3), payload: { reason: 'wrong gauge' } },
      { actor: life.actor, signature: { signer: life.actor.id, meaning: 'void: wrong gauge', signedAt: at(3) } },
    );
    await recordEvent(t.ctx, { idempotencyKey: randomUUID(), type: 'measured', itemCode: code, occurredAt: at(4), payload: FLAT }, { actor: life.actor });
    const clean = (await auditor.get(`/api/items/${code}/trace`).expect(200)).body as TraceView;
    expect(clean.anomalies.filter((a) => a.code === 'missing_step')).toEqual([]);
    const voided = clean.events.find((e) => e.type === 'measured' && e.cancelled);
    expect(voided?.seq).toBe(3);
    expect(clean.events.find((e) => e.type === 'voided')?.signature).toMatchObject({ meaning: 'void: wrong gauge', signerName: expect.stringContaining('Test manager') });
  });

  it('answers 422 for a code whose check character is wrong, and 404 for an unknown one', async () => {
    const wrong = life.halfA.slice(0, -1) + (life.halfA.endsWith('A') ? 'B' : 'A');
    const bad = await auditor.get(`/api/items/${wrong}/trace`).expect(422);
    expect(bad.body.error.message).toMatch(/check character/);
    await auditor.get('/api/items/S26-99999-Z/trace').expect((res) => expect([404, 422]).toContain(res.status));
  });

  it('answers 401 without a session', async () => {
    const { default: request } = await import('supertest');
    await request(t.app).get(`/api/items/${life.halfA}/trace`).expect(401);
  });
});

const FLAT_WIDTHS = ['12.50', '12.52', '12.49'];
const FLAT = { shape: 'flat', width: FLAT_WIDTHS, thickness: ['2.01', '2.00', '2.02'] };
