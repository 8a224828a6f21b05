/**
 * How long a trace takes: on a small ledger (one specimen's life) and on a ledger of 100,000
 * events (10,000 specimens with ten events each, hashed and chained, written straight into the
 * tables); and the lab-wide anomaly list there, judged afresh and from its stored findings
 * (first request, warm, after new events). Prints the times; asserts only what the answers
 * hold, never a duration.
 */
import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { specimenCode } from '../../shared/domain/codes';
import { computeEventHash, GENESIS_HASH, type HashedEvent } from '../../shared/domain/ledger/event-hash';
import { labAnomalies } from '../../server/commands/trace-anomalies';
import { AnomalyListQuerySchema, type AnomalyPage, type TraceView } from '../../shared/schemas/trace';
import type { SignedInAgent } from '../factories';
import type { TestContext } from '../support';
import { createSample } from '../ledger/ledger-fixtures';
import { startTraceRig, type Life } from './trace-fixtures';

/** Events hashed in the test, written straight into the ledger as the owner (much faster than the API for 100,000). */
const INSERT_HASHED_EVENTS_SQL = `INSERT INTO custody_events (item_id, item_code, seq, type, actor_user_id, station_code, container_code, occurred_at,
     recorded_at, payload, idempotency_key, prev_hash, hash)
   SELECT item_id, item, seq, type, actor_user_id, station, container, "occurredAt", "recordedAt", payload, "idempotencyKey", "prevHash", hash
     FROM jsonb_to_recordset($1::jsonb) AS x(item_id bigint, item text, seq integer, type text, actor_user_id integer, station text,
       container text, "occurredAt" timestamptz, "recordedAt" timestamptz, payload jsonb, "idempotencyKey" text, "prevHash" text, hash text)`;

let t: TestContext;
let auditor: SignedInAgent;
let life: Life;

beforeAll(async () => {
  ({ t, auditor, life } = await startTraceRig());
});
afterAll(async () => t?.close());

async function timeIt(label: string, runs: number, fn: () => Promise<void>): Promise<number> {
  await fn(); // warm: first-use module loading and query plans
  const times: number[] = [];
  for (let i = 0; i < runs; i++) {
    const start = performance.now();
    await fn();
    times.push(performance.now() - start);
  }
  times.sort((a, b) => a - b);
  const median = times[Math.floor(times.length / 2)] ?? 0;
  console.log(`[trace timing] ${label}: median ${median.toFixed(1)} ms over ${runs} runs (min ${times[0]?.toFixed(1)}, max ${times.at(-1)?.toFixed(1)})`);
  return median;
}

const PATH = ['registered', 'cut', 'conditioning_started', 'conditioned', 'measured', 'tested', 'binned', 'retained', 'moved', 'moved'];

/** Writes `specimens` specimens with ten chained events each, straight into items, specimens and custody_events. */
async function bulkLedger(specimens: number, userId: number): Promise<string[]> {
  const { sampleId } = await createSample(t);
  const codes: string[] = [];
  const base = Date.now() - 20 * 86_400_000;
  const chunk = 1_000;
  for (let from = 0; from < specimens; from += chunk) {
    const batch = Array.from({ length: Math.min(chunk, specimens - from) }, (_, i) => specimenCode(26, 500_000 + from + i));
    codes.push(...batch);
    const items = await t.owner.query<{ id: string; code: string }>(
      `INSERT INTO items (code, kind, state, last_seq) SELECT c, 'specimen', 'retained', 10 FROM unnest($1::text[]) AS c RETURNING id, code`,
      { bind: [batch], type: QueryTypes.SELECT },
    );
    await t.owner.query(
      `INSERT INTO specimens (item_id, sample_id, serial, geometry_key, shape, test_standard, nominal)
       SELECT id, $2, $3 + ord, 'astm-e8-flat-sheet-12.5', 'flat', 'ASTM E8/E8M', '{}'::jsonb
         FROM unnest($1::bigint[]) WITH ORDINALITY AS u(id, ord)`,
      { bind: [items.map((i) => i.id), sampleId, 500_000 + from - 1] },
    );
    const rows: Record<string, unknown>[] = [];
    const heads: { id: string; hash: string }[] = [];
    for (const [n, item] of items.entries()) {
      let prev = GENESIS_HASH;
      const start = base + (from + n) * 60_000;
      for (let s = 0; s < PATH.length; s++) {
        const at = new Date(start + s * 3_600_000).toISOString();
        const type = PATH[s]!;
        const body: HashedEvent = {
          v: 1,
          item: item.code,
          seq: s + 1,
          type,
          actor: { kind: 'user', id: userId },
          station: null,
          container: type === 'binned' || type === 'retained' || type === 'moved' ? 'C-00001-8' : null,
          occurredAt: at,
          recordedAt: at,
          payload: type === 'tested' ? { fractured: false, maxForceN: 11_000 + n } : type === 'measured' ? { width: ['12.50', '12.51', '12.49'] } : {},
          idempotencyKey: randomUUID(),
          corrects: null,
          signature: null,
          prevHash: prev,
        };
        const hash = computeEventHash(body);
        rows.push({ ...body, item_id: item.id, actor_user_id: userId, hash });
        prev = hash;
      }
      heads.push({ id: item.id, hash: prev });
    }
    await t.owner.query(INSERT_HASHED_EVENTS_SQL, { bind: [JSON.stringify(rows)] });
    await t.owner.query(
      `UPDATE items i SET head_hash = h.hash FROM jsonb_to_recordset($1::jsonb) AS h(id bigint, hash text) WHERE i.id = h.id`,
      { bind: [JSON.stringify(heads)] },
    );
  }
  await t.owner.query('ANALYZE custody_events; ANALYZE items');
  return codes;
}

describe('GET /api/items/:code/trace timing', () => {
  it('prints how long a trace takes on a small ledger and on 100,000 events', { timeout: 600_000 }, async () => {
    const small = await timeIt(`small ledger (${await count()} events), trace of a half`, 10, async () => {
      const trace = (await auditor.get(`/api/items/${life.halfA}/trace`).expect(200)).body as TraceView;
      expect(trace.chainOk).toBe(true);
    });

    const started = performance.now();
    const codes = await bulkLedger(10_000, life.actor.id);
    const total = await count();
    console.log(`[trace timing] wrote ${total} events in ${((performance.now() - started) / 1000).toFixed(1)} s`);
    expect(total).toBeGreaterThanOrEqual(100_000);

    const large = await timeIt(`${total} events, trace of a half`, 10, async () => {
      const trace = (await auditor.get(`/api/items/${life.halfA}/trace`).expect(200)).body as TraceView;
      expect(trace.events).toHaveLength(7);
    });
    const middle = codes[5_000]!;
    await timeIt(`${total} events, trace of a specimen in the middle`, 10, async () => {
      const trace = (await auditor.get(`/api/items/${middle}/trace`).expect(200)).body as TraceView;
      expect(trace.events).toHaveLength(10);
      expect(trace.chainOk).toBe(true);
    });
    await timeIt(`${total} events, audit.jsonl of that specimen`, 5, async () => {
      await auditor.get(`/api/items/${middle}/audit.jsonl`).expect(200);
    });
    let start = performance.now();
    const judged = await labAnomalies(t.sequelize, AnomalyListQuerySchema.parse({}));
    const fresh = performance.now() - start;
    expect(judged.itemsChecked).toBeGreaterThan(10_000);
    console.log(`[trace timing] ${total} events, lab-wide anomalies judged afresh (every chain checked, the list's old way): ${fresh.toFixed(1)} ms`);
    const lab = async (query = '') => {
      const page = (await auditor.get(`/api/anomalies${query}`).expect(200)).body as AnomalyPage;
      expect(page.itemsChecked).toBe(await itemCount());
      return page;
    };
    start = performance.now();
    await lab();
    const cold = performance.now() - start;
    console.log(`[trace timing] ${total} events, lab-wide GET /api/anomalies, first request (sweeps every item into the table): ${cold.toFixed(1)} ms`);
    const warm = await timeIt(`${total} events, lab-wide GET /api/anomalies, nothing new`, 10, async () => {
      await lab();
    });
    await timeIt(`${total} events, lab-wide GET /api/anomalies?severity=critical&page=3`, 10, async () => {
      await lab('?severity=critical&page=3');
    });
    const moved = await appendMoves(codes.slice(2_000, 2_100), life.actor.id);
    start = performance.now();
    const after = await lab();
    const incremental = performance.now() - start;
    expect(new Date(after.checkedAt).getTime()).toBeGreaterThan(0);
    console.log(`[trace timing] ${total + moved} events, lab-wide GET /api/anomalies after ${moved} new events on ${moved} items: ${incremental.toFixed(1)} ms`);
    start = performance.now();
    await lab('?refresh=full');
    console.log(`[trace timing] ${total + moved} events, lab-wide GET /api/anomalies?refresh=full: ${(performance.now() - start).toFixed(1)} ms`);
    console.log(
      `[trace timing] lab-wide list: judged afresh ${fresh.toFixed(1)} ms; stored: first ${cold.toFixed(1)} ms, warm ${warm.toFixed(1)} ms, after ${moved} new events ${incremental.toFixed(1)} ms`,
    );
    console.log(`[trace timing] summary: small ${small.toFixed(1)} ms, 100k-event ledger ${large.toFixed(1)} ms per trace`);
  });
});

/** Appends a `moved` event to each item's chain, straight into the tables, moving its projection row on as the ledger does. */
async function appendMoves(items: readonly string[], userId: number): Promise<number> {
  const heads = await t.owner.query<{ id: string; code: string; last_seq: number; head_hash: string }>(
    'SELECT id, code, last_seq, head_hash FROM items WHERE code = ANY($1::text[])',
    { bind: [items], type: QueryTypes.SELECT },
  );
  const at = new Date().toISOString();
  const rows = heads.map((h) => {
    const body: HashedEvent = {
      v: 1,
      item: h.code,
      seq: h.last_seq + 1,
      type: 'moved',
      actor: { kind: 'user', id: userId },
      station: null,
      container: 'C-00001-8',
      occurredAt: at,
      recordedAt: at,
      payload: {},
      idempotencyKey: randomUUID(),
      corrects: null,
      signature: null,
      prevHash: h.head_hash,
    };
    return { ...body, item_id: h.id, actor_user_id: userId, hash: computeEventHash(body) };
  });
  await t.owner.query(INSERT_HASHED_EVENTS_SQL, { bind: [JSON.stringify(rows)] });
  await t.owner.query(
    `UPDATE items i SET last_seq = x.seq, head_hash = x.hash FROM jsonb_to_recordset($1::jsonb) AS x(item_id bigint, seq integer, hash text)
      WHERE i.id = x.item_id`,
    { bind: [JSON.stringify(rows)] },
  );
  return rows.length;
}

async function itemCount(): Promise<number> {
  const [row] = await t.owner.query<{ n: number }>('SELECT count(*)::integer AS n FROM items', { type: QueryTypes.SELECT });
  return row?.n ?? 0;
}

async function count(): Promise<number> {
  const [row] = await t.owner.query<{ n: number }>('SELECT count(*)::integer AS n FROM custody_events', { type: QueryTypes.SELECT });
  return row?.n ?? 0;
}
