import { randomUUID } from 'node:crypto';
import { QueryTypes } from 'sequelize';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { freePort } from '../../scripts/lib/pg-cluster';
import { startServerChild, stopServerChild, type ServerChild } from '../../scripts/lib/bench-child';
import { rebuildProjections } from '../../server/commands/rebuild-projections';
import { verifyLedger } from '../../server/commands/verify-ledger';
import { createTestContext, testUrl, type TestContext } from '../support';
import { TEST_SESSION_SECRET } from '../test-env';
import { createSample, createSpecimen, createStation, createToken, managerActor } from './ledger-fixtures';

let t: TestContext;
let server: ServerChild | null = null;

beforeAll(async () => {
  t = await createTestContext();
});
afterAll(async () => {
  if (server) await stopServerChild(server, 'SIGKILL');
  await t?.close();
});

async function startServer(port: number): Promise<ServerChild> {
  return startServerChild({
    NODE_ENV: 'test',
    DATABASE_URL: testUrl(t.database, 'app'),
    SESSION_SECRET: TEST_SESSION_SECRET,
    PORT: String(port),
  });
}

type Batch = { events: Record<string, unknown>[] };

async function post(url: string, token: string, batch: Batch): Promise<{ status: number; body: { results: { status: number }[] } } | null> {
  try {
    const res = await fetch(`${url}/api/events/batch`, {
      method: 'POST',
      headers: { 'content-type': 'application/json', authorization: `Bearer ${token}` },
      body: JSON.stringify(batch),
    });
    return { status: res.status, body: (await res.json()) as { results: { status: number }[] } };
  } catch {
    // The server died under this request: the client does not know whether it was recorded.
    return null;
  }
}

describe('a server killed in the middle of a burst of batches', () => {
  it('records every event exactly once after a restart and a retry of everything', { timeout: 180_000 }, async () => {
    const actor = await managerActor(t);
    const { sampleId } = await createSample(t);
    const station = await createStation(t, 'CELL-K', 'frame');
    const token = await createToken(t, station.id, ['cut', 'label_printed']);
    const codes: string[] = [];
    for (let i = 0; i < 100; i++) codes.push(await createSpecimen(t, actor, sampleId));

    // 1,200 events in 48 batches of 25: a cut and eleven label prints per specimen. Each is
    // valid in any order after the cut or before it, so a retry in any order must succeed.
    const now = new Date().toISOString();
    const events = codes.flatMap((code) => [
      { idempotencyKey: randomUUID(), type: 'cut', itemCode: code, occurredAt: now },
      ...Array.from({ length: 11 }, () => ({ idempotencyKey: randomUUID(), type: 'label_printed', itemCode: code, occurredAt: now })),
    ]);
    for (let i = events.length - 1; i > 0; i--) {
      const j = (i * 7919) % (i + 1);
      [events[i], events[j]] = [events[j]!, events[i]!];
    }
    const batches: Batch[] = [];
    for (let i = 0; i < events.length; i += 25) batches.push({ events: events.slice(i, i + 25) });

    const port = await freePort();
    server = await startServer(port);
    const first = server;
    let answered = 0;
    const inFlight = batches.map(async (batch, i) => {
      await new Promise((r) => setTimeout(r, i * 15));
      const res = await post(first.url, token, batch);
      if (res) answered++;
      return res;
    });
    // Kill the server mid-burst, with some batches answered and others not yet.
    while (answered < 8) await new Promise((r) => setTimeout(r, 5));
    await stopServerChild(first, 'SIGKILL');
    const results = await Promise.all(inFlight);
    const lost = results.filter((r) => r === null).length;
    expect(lost).toBeGreaterThan(0);

    server = await startServer(port);
    const restarted = server;
    for (const batch of batches) {
      const res = await post(restarted.url, token, batch);
      expect(res?.status).toBe(200);
      for (const result of res!.body.results) expect([200, 201]).toContain(result.status);
    }

    const keys = events.map((e) => e.idempotencyKey);
    const [row] = await t.sequelize.query<{ rows: number; distinct: number }>(
      'SELECT count(*)::integer AS rows, count(DISTINCT idempotency_key)::integer AS distinct FROM custody_events WHERE idempotency_key = ANY($1::text[])',
      { bind: [keys], type: QueryTypes.SELECT },
    );
    expect(row).toEqual({ rows: events.length, distinct: events.length });
    const perItem = await t.sequelize.query<{ n: number }>(
      `SELECT count(*)::integer AS n FROM custody_events WHERE item_code = ANY($1::text[]) GROUP BY item_code`,
      { bind: [codes], type: QueryTypes.SELECT },
    );
    expect(perItem.every((r) => r.n === 13)).toBe(true);
    expect((await verifyLedger(t.sequelize)).ok).toBe(true);
    expect((await rebuildProjections(t.sequelize)).differences).toEqual([]);
  });
});
