/**
 * The stored anomaly findings against the full computation: after random runs of events on
 * several items (written straight into the ledger's tables, so any chain the detector can judge
 * shows up: steps back in device time, voids, two halves claiming one piece, a broken hash),
 * after time passes, after an order's rule and a station's kind change, and when two sweeps run
 * at once. The reference is labAnomalies, which judges every item afresh; the detector's own
 * rules are tested in shared/domain/anomalies.test.ts. Invented data only.
 */
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { storedLabAnomalies, sweepAnomalies } from '../../server/commands/anomaly-findings';
import { startSealScheduler } from '../../server/commands/seal-day';
import { labAnomalies } from '../../server/commands/trace-anomalies';
import type { LedgerActor } from '../../server/ledger/types';
import { ANOMALY_CODES } from '../../shared/domain/anomalies';
import { containerCode, halfCode, specimenCode } from '../../shared/domain/codes';
import { computeEventHash, GENESIS_HASH, type HashedEvent } from '../../shared/domain/ledger/event-hash';
import { AnomalyListQuerySchema, type AnomalyPage } from '../../shared/schemas/trace';
import { createInstrumentToken, signedInAs, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';
import { createSample, createStation, managerActor } from '../ledger/ledger-fixtures';

const HOUR = 3_600_000;

/** A small seeded generator (mulberry32), so a failing run can be repeated from its seed. */
function generator(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let x = Math.imul(a ^ (a >>> 15), 1 | a);
    x = (x + Math.imul(x ^ (x >>> 7), 61 | x)) ^ x;
    return ((x ^ (x >>> 14)) >>> 0) / 4_294_967_296;
  };
}

interface Chain {
  id: number;
  code: string;
  kind: 'specimen' | 'half' | 'container';
  seq: number;
  head: string;
  hashes: string[];
  /** Device clock of the item's last event. */
  clock: number;
}

let t: TestContext;
let actor: LedgerActor;
let auditor: SignedInAgent;
const chains: Chain[] = [];
let stations: string[] = [];
let containers: string[] = [];
let specimens: string[] = [];
let conditionedOrder = 0;
const seed = Number(process.env.HM_ANOMALY_SEED ?? 20_261_202);
const random = generator(seed);
const pick = <T>(list: readonly T[]): T => list[Math.floor(random() * list.length)]!;

async function chainOf(code: string): Promise<Chain> {
  const [row] = await t.owner.query<{ id: string; kind: Chain['kind']; last_seq: number; head_hash: string | null }>(
    'SELECT id, kind, last_seq, head_hash FROM items WHERE code = $1',
    { bind: [code], type: QueryTypes.SELECT },
  );
  if (!row) throw new Error(`no item ${code}`);
  const hashes = await t.owner.query<{ hash: string }>('SELECT hash FROM custody_events WHERE item_id = $1 ORDER BY seq', {
    bind: [row.id],
    type: QueryTypes.SELECT,
  });
  return { id: Number(row.id), code, kind: row.kind, seq: row.last_seq, head: row.head_hash ?? GENESIS_HASH, hashes: hashes.map((h) => h.hash), clock: 0 };
}

/**
 * An item written straight into items (and specimens, for a specimen of `sampleId`), as an
 * import of another lab's chains might; its chain starts empty.
 */
async function rawItem(kind: Chain['kind'], opts: { code?: string; parent?: string; sampleId?: number } = {}): Promise<Chain> {
  let code = opts.code ?? '';
  if (kind === 'specimen' || kind === 'container') {
    const [row] = await t.owner.query<{ n: string }>(`SELECT nextval('${kind}_serial_seq') AS n`, { type: QueryTypes.SELECT });
    code = kind === 'specimen' ? specimenCode(26, Number(row!.n)) : containerCode(Number(row!.n));
  }
  const [item] = await t.owner.query<{ id: string }>(
    `INSERT INTO items (code, kind, state, parent_item_id, half)
     VALUES ($1, $2, 'none', (SELECT id FROM items WHERE code = $3), $4) RETURNING id`,
    { bind: [code, kind, opts.parent ?? null, kind === 'half' ? code.slice(-3, -2) : null], type: QueryTypes.SELECT },
  );
  if (kind === 'specimen') {
    await t.owner.query(
      `INSERT INTO specimens (item_id, sample_id, serial, geometry_key, shape, test_standard, nominal)
       VALUES ($1, $2, $3, 'astm-e8-flat-sheet-12.5', 'flat', 'ASTM E8/E8M', '{}'::jsonb)`,
      { bind: [item!.id, opts.sampleId, Number(code.split('-')[1])] },
    );
  }
  return chainOf(code);
}

/**
 * Appends one event to an item's chain, hashed and chained as the ledger does, and moves the
 * item's projection row on as the engine would (or, with `quiet`, leaves the row alone, as a
 * writer that forgot would). `broken` chains it to a wrong previous hash.
 */
async function append(
  chain: Chain,
  event: { type: string; occurredAt: number; recordedAt: number; station: string | null; container: string | null; payload?: HashedEvent['payload']; corrects?: string | null },
  opts: { quiet?: boolean; broken?: boolean } = {},
): Promise<void> {
  const body: HashedEvent = {
    v: 1,
    item: chain.code,
    seq: chain.seq + 1,
    type: event.type,
    actor: { kind: 'user', id: actor.id },
    station: event.station,
    container: event.container,
    occurredAt: new Date(event.occurredAt).toISOString(),
    recordedAt: new Date(event.recordedAt).toISOString(),
    payload: event.payload ?? {},
    idempotencyKey: randomUUID(),
    corrects: event.corrects ?? null,
    signature: null,
    prevHash: opts.broken ? 'e'.repeat(64) : chain.head,
  };
  const hash = computeEventHash(body);
  await t.owner.query(
    `INSERT INTO custody_events (item_id, item_code, seq, type, actor_user_id, station_code, container_code, occurred_at, recorded_at,
       payload, idempotency_key, corrects_hash, prev_hash, hash)
     VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10::jsonb, $11, $12, $13, $14)`,
    {
      bind: [chain.id, chain.code, body.seq, body.type, actor.id, body.station, body.container, body.occurredAt, body.recordedAt,
        JSON.stringify(body.payload), body.idempotencyKey, body.corrects, body.prevHash, hash],
    },
  );
  chain.seq = body.seq;
  chain.head = hash;
  chain.hashes.push(hash);
  if (!opts.quiet) {
    await t.owner.query('UPDATE items SET last_seq = $2, head_hash = $3, state = $4 WHERE id = $1', {
      bind: [chain.id, chain.seq, hash, event.type === 'voided' ? 'none' : event.type],
    });
  }
}

const TYPES: Record<Chain['kind'], readonly string[]> = {
  specimen: ['cut', 'conditioning_started', 'conditioned', 'measured', 'tested', 'binned', 'retained', 'moved', 'held', 'released', 'rejected', 'returned', 'voided'],
  half: ['split_from', 'binned', 'retained', 'moved', 'disposed', 'voided'],
  container: ['moved', 'moved', 'sent', 'received'],
};

/** One random event on a random item, recorded at most at `now`; device clocks step back now and then. */
async function randomEvent(now: number): Promise<void> {
  const chain = pick(chains);
  const type = pick(TYPES[chain.kind]);
  const step = random() < 0.15 ? -(1 + random() * 30) * HOUR : (0.2 + random() * 40) * HOUR;
  const occurredAt = Math.round(Math.max(chain.clock, now - 200 * HOUR) + step);
  chain.clock = Math.max(chain.clock, occurredAt);
  // Mostly recorded when it happened; sometimes the device clock runs ahead of the server's.
  const recordedAt = Math.min(now, random() < 0.1 ? occurredAt - (0.5 + random() * 3) * HOUR : occurredAt);
  let payload: HashedEvent['payload'] = {};
  if (type === 'tested') payload = { fractured: random() < 0.5, maxForceN: 11_000 };
  if (type === 'conditioning_started' || type === 'conditioned') {
    payload = { chamber: [{ temperatureC: 21 + random() * 4, humidityPct: 40 + random() * 20 }] };
  }
  if (type === 'split_from') payload = { from: pick(specimens), half: random() < 0.5 ? 'A' : 'B' };
  const corrects = type === 'voided' ? pick(chain.hashes) : null;
  await append(
    chain,
    {
      type,
      occurredAt,
      recordedAt,
      station: random() < 0.8 ? pick(stations) : null,
      container: random() < 0.5 ? pick(containers) : null,
      payload,
      corrects,
    },
    { quiet: random() < 0.15, broken: random() < 0.01 },
  );
}

const QUERIES = [
  {},
  { page: '2', pageSize: '5' },
  { severity: 'critical' },
  { severity: 'warning', pageSize: '3', page: '2' },
  { code: 'long_dwell' },
  { code: 'half_claimed_twice' },
  { code: 'out_of_sequence', severity: 'info' },
].map((q) => AnomalyListQuerySchema.parse({ pageSize: '200', ...q }));

const seen = new Set<string>();

/** The stored list, swept as GET /api/anomalies does, equals judging every item afresh at `now`. */
async function expectSameAsFresh(now: Date): Promise<AnomalyPage> {
  let whole: AnomalyPage | null = null;
  for (const query of QUERIES) {
    const stored = await storedLabAnomalies(t.sequelize, query, { now });
    const fresh = await labAnomalies(t.sequelize, query, now);
    expect(stored, `seed ${seed}, ${JSON.stringify(query)} at ${now.toISOString()}`).toEqual(fresh);
    whole ??= stored;
  }
  for (const a of whole?.items ?? []) seen.add(a.code);
  return whole!;
}

async function judgedAt(code: string): Promise<string> {
  const [row] = await t.owner.query<{ at: string }>(
    `SELECT s.judged_at::text AS at FROM anomaly_item_state s JOIN items i ON i.id = s.item_id WHERE i.code = $1`,
    { bind: [code], type: QueryTypes.SELECT },
  );
  return row?.at ?? '';
}

// Forty days ago, a whole hour: every instant the runs judge at lies before the requests' real clock.
const T0 = Math.floor((Date.now() - 40 * 24 * HOUR) / HOUR) * HOUR;

beforeAll(async () => {
  t = await createTestContext();
  auditor = await signedInAs(t, 'auditor');
  actor = await managerActor(t);
  const tag = randomUUID().slice(0, 4).toUpperCase();
  stations = [
    (await createStation(t, `SAW-R${tag}`, 'saw')).code,
    (await createStation(t, `CHAMBER-R${tag}`, 'conditioning')).code,
    (await createStation(t, `GAUGE-R${tag}`, 'gauge')).code,
    (await createStation(t, `STORE-R${tag}`, 'store')).code,
    // Never registered: the detector takes the default limit for a station it does not know.
    `BENCH-R${tag}`,
  ];
  const plain = await createSample(t);
  const plastic = await createSample(t);
  conditionedOrder = plastic.orderId;
  // A plastics order whose rule asks for 40 h at 23 °C ± 2 / 50 % RH ± 10 (ASTM D618 Procedure A
  // for up to 7 mm, CHECKS.md [copy]).
  await t.owner.query(
    `UPDATE orders SET conditioning = '{"temperatureC":23,"temperatureTolC":2,"humidityPct":50,"humidityTolPct":10,"minHours":40}' WHERE id = $1`,
    { bind: [plastic.orderId] },
  );
  await t.owner.query('UPDATE samples SET thickness_mm = 3.2 WHERE id = $1', { bind: [plastic.sampleId] });
  const start = T0 - 100 * HOUR;
  const register = { type: 'registered', occurredAt: start, recordedAt: start, station: null, container: null };
  for (let i = 0; i < 5; i++) {
    const chain = await rawItem('specimen', { sampleId: (i % 2 === 0 ? plain : plastic).sampleId });
    await append(chain, register);
    specimens.push(chain.code);
    chains.push(chain);
  }
  for (let i = 0; i < 2; i++) {
    const chain = await rawItem('container');
    await append(chain, register);
    containers.push(chain.code);
    chains.push(chain);
  }
  // Never registered: a container code the detector only knows from events.
  containers.push(containerCode(99_999));
  // The halves of two specimens, and a half of a third that claims a piece of the first.
  const claimed = await rawItem('half', { code: halfCode(specimens[0]!, 'A'), parent: specimens[0]! });
  const claimer = await rawItem('half', { code: halfCode(specimens[2]!, 'B'), parent: specimens[2]! });
  chains.push(claimed, claimer);
  chains.push(await rawItem('half', { code: halfCode(specimens[0]!, 'B'), parent: specimens[0]! }));
  chains.push(await rawItem('half', { code: halfCode(specimens[1]!, 'A'), parent: specimens[1]! }));
  for (const c of chains) c.clock = start;
  // Two codes for one piece from the start: both halves say they are A of the first specimen.
  const split = { type: 'split_from', station: stations[0]!, container: null, payload: { from: specimens[0]!, half: 'A' } };
  await append(claimed, { ...split, occurredAt: T0 - 90 * HOUR, recordedAt: T0 - 90 * HOUR });
  await append(claimer, { ...split, occurredAt: T0 - 89 * HOUR, recordedAt: T0 - 89 * HOUR });
}, 120_000);
afterAll(async () => t?.close());

describe('stored anomaly findings', () => {
  it('equal a fresh full computation after each of several random runs, and after time passes', { timeout: 300_000 }, async () => {
    const itemCount = async () => (await t.owner.query<{ n: number }>('SELECT count(*)::integer AS n FROM items', { type: QueryTypes.SELECT }))[0]!.n;
    let now = T0;
    const first = await sweepAnomalies(t.sequelize, { now: new Date(now) });
    expect(first.judged).toBe(await itemCount());
    await expectSameAsFresh(new Date(now));
    const judgedPerRound: number[] = [];
    for (let round = 1; round <= 8; round++) {
      now += 30 * HOUR;
      for (let i = 0; i < 12; i++) await randomEvent(now);
      if (round === 3) {
        // The order's rule gets stricter after the fact: its specimens are judged against the new one.
        await t.owner.query(
          `UPDATE orders SET conditioning = '{"temperatureC":23,"temperatureTolC":1,"humidityPct":50,"humidityTolPct":5,"minHours":88}' WHERE id = $1`,
          { bind: [conditionedOrder] },
        );
      }
      if (round === 5) {
        // The gauge becomes a store (no dwell limit), and the unknown bench is registered as a saw.
        await t.owner.query(`UPDATE stations SET kind = 'store' WHERE code = $1`, { bind: [stations[2]] });
        await createStation(t, stations[4]!, 'saw');
      }
      if (round === 6) {
        // A new item with no events yet, then one with a first event.
        chains.push(await rawItem('specimen', { sampleId: (await createSample(t)).sampleId }));
        const fresh = await rawItem('specimen', { sampleId: (await createSample(t)).sampleId });
        await append(fresh, { type: 'registered', occurredAt: now - HOUR, recordedAt: now - HOUR, station: stations[0]!, container: null });
        fresh.clock = now - HOUR;
        chains.push(fresh);
      }
      const swept = await sweepAnomalies(t.sequelize, { now: new Date(now) });
      judgedPerRound.push(swept.judged);
      await expectSameAsFresh(new Date(now));
      // Time passes with no new events: stays cross their limits, long dwells count on.
      await expectSameAsFresh(new Date(now + 7 * HOUR + 123));
      await expectSameAsFresh(new Date(now + 26 * HOUR));
    }
    // Each round judged only what moved, not the whole lab.
    expect(Math.min(...judgedPerRound)).toBeLessThan(await itemCount());
    // The runs reached the cross-item, time-dependent and chain rules, not only the easy ones.
    expect([...seen].sort()).toEqual(expect.arrayContaining(['half_claimed_twice', 'long_dwell', 'out_of_sequence', 'missing_step']));
    console.log(`[anomaly findings] seed ${seed}: judged per round ${judgedPerRound.join(', ')} of ${await itemCount()} items; codes seen ${[...seen].sort().join(', ')}`);
  });

  it('judges again exactly the items a change without a new event touches', async () => {
    const now = new Date(T0 + 12 * 24 * HOUR);
    // 100 h in the chamber, under a chamber's week; over the 72 h of any other kind of station.
    const dweller = await rawItem('half', { code: halfCode(specimens[1]!, 'B'), parent: specimens[1]! });
    chains.push(dweller);
    const stay = { station: stations[1]!, container: null, payload: { from: specimens[1]!, half: 'B' } };
    await append(dweller, { ...stay, type: 'split_from', occurredAt: now.getTime() - 150 * HOUR, recordedAt: now.getTime() - 150 * HOUR });
    await append(dweller, { ...stay, type: 'moved', station: stations[0]!, occurredAt: now.getTime() - 50 * HOUR, recordedAt: now.getTime() - 50 * HOUR });
    await sweepAnomalies(t.sequelize, { now });
    const sweep = async () => (await sweepAnomalies(t.sequelize, { now })).judged;
    expect(await sweep()).toBe(0);

    // A projection rebuilt to another state: the list shows the item's state as it is now.
    const rebuilt = chains.find((c) => c.code === halfCode(specimens[0]!, 'A'))!;
    await t.owner.query(`UPDATE items SET state = 'held' WHERE id = $1`, { bind: [rebuilt.id] });
    expect(await sweep()).toBe(1);
    const page = await expectSameAsFresh(now);
    expect(page.items.filter((a) => a.item === rebuilt.code).map((a) => a.state)).toContain('held');

    // The order's rule changes: its two specimens are judged against the new one.
    await t.owner.query(
      `UPDATE orders SET conditioning = '{"temperatureC":27,"temperatureTolC":2,"humidityPct":65,"humidityTolPct":5,"minHours":24}' WHERE id = $1`,
      { bind: [conditionedOrder] },
    );
    expect(await sweep()).toBe(2);
    await expectSameAsFresh(now);

    // The chamber becomes a frame: every item that ever stood there is judged again.
    await t.owner.query(`UPDATE stations SET kind = 'frame' WHERE code = $1`, { bind: [stations[1]] });
    const [there] = await t.owner.query<{ n: number }>(
      'SELECT count(DISTINCT item_id)::integer AS n FROM custody_events WHERE station_code = $1',
      { bind: [stations[1]], type: QueryTypes.SELECT },
    );
    // With them, the items that share a piece with a half among them.
    const judged = await sweep();
    expect(judged).toBeGreaterThanOrEqual(there!.n);
    expect(judged).toBeLessThan(chains.length);
    const moved = await expectSameAsFresh(now);
    expect(moved.items).toContainEqual(expect.objectContaining({ item: dweller.code, code: 'long_dwell', details: expect.objectContaining({ hours: 100, limitHours: 72 }) }));

    // A half with no placement of its own whose code another half claims: an event that places
    // neither of them still finds the claim, from the claimant that was not judged again.
    const named = await rawItem('half', { code: halfCode(specimens[4]!, 'A'), parent: specimens[4]! });
    const claimant = await rawItem('half', { code: halfCode(specimens[4]!, 'B'), parent: specimens[4]! });
    chains.push(named, claimant);
    const at = now.getTime() - 5 * HOUR;
    await append(claimant, { type: 'split_from', occurredAt: at, recordedAt: at, station: stations[0]!, container: null, payload: { from: specimens[4]!, half: 'A' } });
    expect(await sweep()).toBe(2);
    await append(named, { type: 'label_printed', occurredAt: at + HOUR, recordedAt: at + HOUR, station: null, container: null });
    expect(await sweep()).toBe(1);
    const claimed = await expectSameAsFresh(now);
    expect(claimed.items).toContainEqual(expect.objectContaining({ item: named.code, code: 'half_claimed_twice' }));
  });

  it('re-words a long dwell still going on at the check time without judging its item again', async () => {
    const chain = await rawItem('half', { code: halfCode(specimens[3]!, 'A'), parent: specimens[3]! });
    const { code } = chain;
    const at = T0 + 15 * 24 * HOUR;
    // At a gauge (72 h by default) since 80 h before `at`: a long dwell going on.
    const gauge = (await createStation(t, `GAUGE-W${randomUUID().slice(0, 4)}`, 'gauge')).code;
    await append(chain, { type: 'binned', occurredAt: at - 80 * HOUR, recordedAt: at - 80 * HOUR, station: gauge, container: null });
    chains.push(chain);
    const before = await expectSameAsFresh(new Date(at));
    const judged = await judgedAt(code);
    const later = await storedLabAnomalies(t.sequelize, AnomalyListQuerySchema.parse({ code: 'long_dwell', pageSize: '200' }), {
      now: new Date(at + 2 * HOUR),
    });
    expect(later).toEqual(await labAnomalies(t.sequelize, AnomalyListQuerySchema.parse({ code: 'long_dwell', pageSize: '200' }), new Date(at + 2 * HOUR)));
    const dwell = (page: AnomalyPage) => page.items.find((a) => a.item === code && a.code === 'long_dwell');
    expect(dwell(before)?.details).toMatchObject({ hours: 80, ongoing: true });
    expect(dwell(later)?.details).toMatchObject({ hours: 82, ongoing: true });
    expect(await judgedAt(code)).toBe(judged);
  });

  it('does not duplicate findings when two sweeps run at once', async () => {
    const now = new Date(T0 + 20 * 24 * HOUR);
    await t.owner.query(`UPDATE anomaly_item_state SET recheck_at = '-infinity'`);
    const items = (await t.owner.query<{ n: number }>('SELECT count(*)::integer AS n FROM items', { type: QueryTypes.SELECT }))[0]!.n;
    const both = await Promise.all([sweepAnomalies(t.sequelize, { now }), sweepAnomalies(t.sequelize, { now })]);
    // The second waits for the first's lock, then finds nothing left to judge.
    expect(both.map((s) => s.judged).sort((a, b) => a - b)).toEqual([0, items]);
    const [dupes] = await t.owner.query<{ n: number }>(
      'SELECT count(*)::integer AS n FROM (SELECT item_id, code, event_seq, message FROM anomaly_findings GROUP BY 1, 2, 3, 4 HAVING count(*) > 1) d',
      { type: QueryTypes.SELECT },
    );
    expect(dupes?.n).toBe(0);
    await expectSameAsFresh(now);
    // Two requests at once: both answer the fresh list.
    const later = new Date(now.getTime() + HOUR);
    await t.owner.query(`UPDATE anomaly_item_state SET recheck_at = '-infinity'`);
    const query = AnomalyListQuerySchema.parse({ pageSize: '200' });
    const pages = await Promise.all([storedLabAnomalies(t.sequelize, query, { now: later }), storedLabAnomalies(t.sequelize, query, { now: later })]);
    const fresh = await labAnomalies(t.sequelize, query, later);
    expect(pages).toEqual([fresh, fresh]);
  });
});

describe('GET /api/anomalies', () => {
  it('answers what a fresh computation at its check time gives, and knows every anomaly code', async () => {
    const res = await auditor.get('/api/anomalies?pageSize=200').expect(200);
    const page = res.body as AnomalyPage;
    const fresh = await labAnomalies(t.sequelize, AnomalyListQuerySchema.parse({ pageSize: '200' }), new Date(page.checkedAt));
    expect(page).toEqual(JSON.parse(JSON.stringify(fresh)));
    for (const a of page.items) expect(ANOMALY_CODES).toContain(a.code);
  });

  it('re-judges every item on refresh=full for people with ledger.verify, and refuses instruments', async () => {
    await t.owner.query(`UPDATE anomaly_sweep_state SET full_swept_at = NULL`);
    const page = (await auditor.get('/api/anomalies?refresh=full&pageSize=200').expect(200)).body as AnomalyPage;
    const [state] = await t.owner.query<{ full: string | null; judged: number }>(
      'SELECT full_swept_at::text AS full, items_judged AS judged FROM anomaly_sweep_state',
      { type: QueryTypes.SELECT },
    );
    expect(state?.full).not.toBeNull();
    expect(state?.judged).toBe(page.itemsChecked);
    await auditor.get('/api/anomalies?refresh=partly').expect(422);
    const instrument = (await createInstrumentToken(t, { eventTypes: ['cut'] })).token;
    await request(t.app).get('/api/anomalies').set('Authorization', `Bearer ${instrument}`).expect(200);
    const refused = await request(t.app).get('/api/anomalies?refresh=full').set('Authorization', `Bearer ${instrument}`).expect(403);
    expect(refused.body.error.details).toEqual({ action: 'ledger.verify' });
  });

  it('finds a new event on the next request', async () => {
    const chain = chains.find((c) => c.code === specimens[3])!;
    const now = Date.now();
    // Dated before every other event of the item: out of sequence, found without a full sweep.
    await append(chain, { type: 'moved', occurredAt: T0 - 200 * HOUR, recordedAt: now, station: stations[0]!, container: null });
    const page = (await auditor.get(`/api/anomalies?code=out_of_sequence&pageSize=200`).expect(200)).body as AnomalyPage;
    expect(page.items).toContainEqual(expect.objectContaining({ item: chain.code, code: 'out_of_sequence', eventSeq: chain.seq }));
  });
});

describe('the seal scheduler', () => {
  it('re-judges every item after it seals a day', async () => {
    await t.owner.query(`UPDATE anomaly_sweep_state SET full_swept_at = NULL`);
    const scheduler = startSealScheduler(t.sequelize, 3_600_000);
    try {
      const days = await scheduler.tick();
      expect(days.length).toBeGreaterThan(0);
    } finally {
      scheduler.stop();
    }
    const [state] = await t.owner.query<{ full: string | null }>('SELECT full_swept_at::text AS full FROM anomaly_sweep_state', {
      type: QueryTypes.SELECT,
    });
    expect(state?.full).not.toBeNull();
  });
});
