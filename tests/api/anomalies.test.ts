import { randomUUID } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordEvent } from '../../server/commands/record-event';
import type { AnomalyPage, TraceView } from '../../shared/schemas/trace';
import type { SignedInAgent } from '../factories';
import type { TestContext } from '../support';
import { countRows, createSample, createSpecimen, FLAT_READINGS, scan } from '../ledger/ledger-fixtures';
import { startTraceRig, type Life } from './trace-fixtures';

let t: TestContext;
let auditor: SignedInAgent;
let life: Life;
let late: string;
let plastic: string;

beforeAll(async () => {
  ({ t, auditor, life } = await startTraceRig());
  const hour = 3_600_000;
  const at = (hoursAgo: number) => new Date(Date.now() - hoursAgo * hour).toISOString();
  const rec = (type: string, itemCode: string, occurredAt: string, extra: Record<string, unknown> = {}) =>
    recordEvent(t.ctx, { idempotencyKey: randomUUID(), type, itemCode, occurredAt, ...extra }, { actor: life.actor });

  // A specimen measured with a device clock five hours behind its cut: out of sequence.
  const { sampleId } = await createSample(t);
  late = await createSpecimen(t, life.actor, sampleId);
  await rec('cut', late, at(1));
  await rec('measured', late, at(6), { payload: FLAT_READINGS });

  // A plastics order whose rule asks for 40 h at 23 °C / 50 % RH (the ASTM D618 Procedure A
  // figures for up to 7 mm, CHECKS.md [copy]); its specimen left the chamber after 20 h.
  const poly = await createSample(t);
  await t.owner.query(
    `UPDATE orders SET conditioning = '{"temperatureC":23,"temperatureTolC":2,"humidityPct":50,"humidityTolPct":10,"minHours":40}' WHERE id = $1`,
    { bind: [poly.orderId] },
  );
  await t.owner.query('UPDATE samples SET thickness_mm = 3.2 WHERE id = $1', { bind: [poly.sampleId] });
  plastic = await createSpecimen(t, life.actor, poly.sampleId);
  await rec('cut', plastic, at(22));
  await rec('conditioning_started', plastic, at(21));
  await rec('conditioned', plastic, at(1));
});
afterAll(async () => t?.close());

describe('GET /api/anomalies', () => {
  it('lists anomalies across the lab, most serious first, with counts per severity', async () => {
    const res = await auditor.get('/api/anomalies').expect(200);
    const page = res.body as AnomalyPage;
    expect(page.itemsChecked).toBe(await countRows(t, 'items'));
    const codes = page.items.map((a) => [a.item, a.code]);
    expect(codes).toEqual(expect.arrayContaining([[late, 'out_of_sequence'], [plastic, 'short_conditioning']]));
    // The clean life has nothing to report.
    expect(page.items.filter((a) => [life.specimen, life.halfA, life.halfB].includes(a.item))).toEqual([]);
    const ranks = page.items.map((a) => ({ info: 0, warning: 1, critical: 2 })[a.severity]);
    expect(ranks).toEqual([...ranks].sort((a, b) => b - a));
    expect(page.counts.warning).toBeGreaterThanOrEqual(2);
    const short = page.items.find((a) => a.code === 'short_conditioning');
    expect(short).toMatchObject({ severity: 'warning', details: { hours: 20, minHours: 40 } });
  });

  it('pages and filters by severity', async () => {
    const all = (await auditor.get('/api/anomalies?pageSize=1').expect(200)).body as AnomalyPage;
    expect(all.items).toHaveLength(1);
    expect(all.total).toBeGreaterThanOrEqual(2);
    const second = (await auditor.get('/api/anomalies?pageSize=1&page=2').expect(200)).body as AnomalyPage;
    expect(second.items[0]).not.toEqual(all.items[0]);
    const warnings = (await auditor.get('/api/anomalies?severity=warning').expect(200)).body as AnomalyPage;
    expect(warnings.items.every((a) => a.severity === 'warning')).toBe(true);
    await auditor.get('/api/anomalies?severity=loud').expect(422);
  });

  it('shows the same findings on the item trace, with the order’s conditioning rule applied', async () => {
    const trace = (await auditor.get(`/api/items/${plastic}/trace`).expect(200)).body as TraceView;
    expect(trace.anomalies.map((a) => a.code)).toContain('short_conditioning');
  });
});

describe('the auditor reads everything and changes nothing', () => {
  it('may read traces, packs, search and anomalies, and is refused every write', async () => {
    await auditor.get(`/api/items/${life.halfA}/trace`).expect(200);
    await auditor.get(`/api/items/${life.halfA}/audit.jsonl`).expect(200);
    await auditor.get(`/api/search?q=${life.orderNumber}`).expect(200);
    await auditor.get('/api/ledger/verify').expect(200);
    const before = await countRows(t, 'custody_events');
    const event = await auditor.post('/api/events', scan('moved', life.halfA, { containerCode: life.shelf })).expect(403);
    expect(event.body.error.code).toBe('forbidden');
    await auditor.post('/api/attachments').attach('file', Buffer.from('a,b\n1,2\n'), 'x.csv').expect(403);
    await auditor.post('/api/events/batch', { events: [scan('moved', life.halfA, { containerCode: life.shelf })] }).expect(403);
    expect(await countRows(t, 'custody_events')).toBe(before);
    await request(t.app).get('/api/anomalies').expect(401);
  });
});
