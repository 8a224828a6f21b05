/**
 * npm run bench: the scan API under load, against a server process on its own throwaway
 * database, beside a baseline of the same database transaction done directly with pg.
 *
 * Phases (each BENCH_SECONDS long, 8 by default): single scans from 8 and from 32 concurrent
 * clients, then batches of 50 events from 4 clients; each followed by its baseline. Prints
 * events/s, p50 and p99 latency, app/baseline ratios, the server's peak resident memory (sampled
 * from /proc/<pid>/status every 100 ms, and the kernel's VmHWM), and the label bench's figures.
 */
import { randomBytes, randomUUID } from 'node:crypto';
import { mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { QueryTypes } from 'sequelize';
import { specimenCode } from '../shared/domain/codes';
import { emptyProjection } from '../shared/domain/ledger/state-machine';
import { benchLabels } from '../labels/bench-labels';
import { createContext } from '../server/app';
import { signSession } from '../server/auth/session';
import { recordEvents } from '../server/commands/record-event';
import { loadConfig } from '../server/config';
import { createSequelize } from '../server/db';
import { verifyLedger } from '../server/commands/verify-ledger';
import { runBaselinePhase } from './lib/bench-baseline';
import { startServerChild, stopServerChild } from './lib/bench-child';
import { runHttpPhase, type PhaseResult } from './lib/bench-load';
import { migrateUp } from './lib/migrate';
import { freePort, provisionDatabase, roleUrl, startCluster, type PgCluster } from './lib/pg-cluster';
import { ensureSystemPackages, NEEDS } from './lib/system-packages';

const SECONDS = Number(process.env.BENCH_SECONDS ?? 8);
const ITEMS = 6_000;
const POOL = 16;
const tmp = mkdtempSync(path.join(os.tmpdir(), 'halfmark-bench-'));
let cluster: PgCluster | null = null;

function rssOf(pid: number, field: 'VmRSS' | 'VmHWM'): number {
  try {
    const match = new RegExp(`${field}:\\s+(\\d+) kB`).exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
    return match?.[1] ? Number(match[1]) / 1024 : 0;
  } catch {
    return 0;
  }
}

async function seed(appUrl: string, secret: string): Promise<{ userId: number; codes: string[] }> {
  const sequelize = createSequelize(appUrl, { poolMax: 4 });
  const ctx = createContext(loadConfig({ NODE_ENV: 'production', DATABASE_URL: appUrl, SESSION_SECRET: secret }), sequelize);
  const [user] = await sequelize.query<{ id: number }>(
    `INSERT INTO users (email, name, role) VALUES ('bench@lab.example', 'Bench Runner', 'manager') RETURNING id`,
    { type: QueryTypes.SELECT },
  );
  const userId = Number(user?.id);
  const codes = Array.from({ length: ITEMS }, (_, i) => specimenCode(26, i + 1));
  await sequelize.query(
    `INSERT INTO items (code, kind, state, projection)
     SELECT c, 'specimen', 'none', jsonb_set($2::jsonb, '{item}', to_jsonb(c)) FROM unnest($1::text[]) AS c`,
    { bind: [codes, JSON.stringify(emptyProjection('specimen', null))] },
  );
  const now = new Date().toISOString();
  for (let i = 0; i < codes.length; i += 500) {
    const inputs = codes.slice(i, i + 500).map((code) => ({ idempotencyKey: randomUUID(), type: 'registered', itemCode: code, occurredAt: now, payload: {} }));
    const outcomes = await recordEvents(ctx, inputs, { actor: { kind: 'user', id: userId, role: 'manager' }, allowRegistration: true });
    const refused = outcomes.filter((o) => o.status >= 300);
    if (refused.length > 0) throw new Error(`seeding refused: ${JSON.stringify(refused[0])}`);
  }
  await sequelize.close();
  return { userId, codes };
}

/** CPU seconds (user + system) a process has used so far, from /proc/<pid>/stat. */
function cpuSecondsOf(pid: number): number {
  try {
    const fields = readFileSync(`/proc/${pid}/stat`, 'utf8').split(') ')[1]?.split(' ') ?? [];
    return (Number(fields[11]) + Number(fields[12])) / 100;
  } catch {
    return 0;
  }
}

function fmt(r: PhaseResult): string {
  return `${r.name.padEnd(30)} ${String(r.clients).padStart(3)}  ${r.eventsPerSecond.toFixed(0).padStart(8)} ev/s  p50 ${r.p50Ms.toFixed(1).padStart(6)} ms  p99 ${r.p99Ms.toFixed(1).padStart(6)} ms  errors ${r.errors}`;
}

let exitCode = 0;
try {
  ensureSystemPackages([NEEDS.postgresql], 'npm run bench');
  console.log(`Halfmark bench: ${os.cpus().length} CPU(s), ${SECONDS} s per phase. Starting a throwaway PostgreSQL …`);
  // A throwaway cluster like the tests' (fsync off): the figures are the application's and the
  // database's CPU cost, not this machine's disk flush time; set BENCH_FSYNC=on to include it.
  const throwaway = process.env.BENCH_FSYNC !== 'on';
  cluster = startCluster({ dir: tmp, port: await freePort(), superPassword: randomBytes(12).toString('base64url'), throwaway });
  const roles = {
    database: 'halfmark_bench',
    owner: { name: 'halfmark_owner', password: randomBytes(12).toString('base64url') },
    app: { name: 'halfmark_app', password: randomBytes(12).toString('base64url') },
  };
  await provisionDatabase(cluster.adminUrl(), roles);
  const ownerUrl = roleUrl(cluster.port, roles.database, roles.owner);
  const appUrl = roleUrl(cluster.port, roles.database, roles.app);
  await migrateUp(ownerUrl, appUrl);
  const secret = randomBytes(32).toString('base64url');
  const { userId, codes } = await seed(appUrl, secret);
  console.log(`Seeded ${codes.length} specimens with their registered events (fsync ${throwaway ? 'off' : 'on'}; load average ${os.loadavg()[0]!.toFixed(1)}).`);

  const server = await startServerChild({ NODE_ENV: 'production', DATABASE_URL: appUrl, SESSION_SECRET: secret, PORT: '0', DB_POOL_MAX: String(POOL) });
  let peakRss = rssOf(server.pid, 'VmRSS');
  const sampler = setInterval(() => {
    peakRss = Math.max(peakRss, rssOf(server.pid, 'VmRSS'));
  }, 100);
  const csrf = randomBytes(16).toString('base64url');
  const headers = { cookie: `hm_session=${signSession(secret, userId, 0)}; hm_csrf=${csrf}`, 'x-csrf-token': csrf };

  let cursor = 0;
  const nextCodes = (n: number) => Array.from({ length: n }, () => codes[cursor++ % codes.length]!);
  const scanBody = () => ({ idempotencyKey: randomUUID(), type: 'label_printed', itemCode: nextCodes(1)[0], occurredAt: new Date().toISOString() });
  const batchBody = () => ({
    events: nextCodes(50).map((code) => ({ idempotencyKey: randomUUID(), type: 'label_printed', itemCode: code, occurredAt: new Date().toISOString() })),
  });
  // The server's CPU time per event: steadier than throughput on a machine shared with others.
  const cpuPerEvent = new Map<string, number>();
  const http = async (name: string, clients: number, batch: boolean, seconds = SECONDS) => {
    const before = cpuSecondsOf(server.pid);
    const result = await runHttpPhase({ name, url: server.url, path: batch ? '/api/events/batch' : '/api/events', headers, clients, seconds, next: batch ? batchBody : scanBody, eventsPer: batch ? 50 : 1 });
    cpuPerEvent.set(`${name} ${clients}`, ((cpuSecondsOf(server.pid) - before) * 1000) / Math.max(1, result.events));
    return result;
  };
  const base = (name: string, clients: number, perTransaction: number) =>
    runBaselinePhase({ name, url: appUrl, poolSize: POOL, clients, seconds: SECONDS, perTransaction, nextCodes, userId });

  await http('warm-up', 8, false, 3);
  const results: [PhaseResult, PhaseResult][] = [];
  for (const clients of [8, 32]) {
    results.push([await http(`single scans, app`, clients, false), await base(`single scans, pg baseline`, clients, 1)]);
  }
  results.push([await http('batches of 50, app', 4, true), await base('batches of 50, pg baseline', 4, 50)]);
  clearInterval(sampler);
  const hwm = rssOf(server.pid, 'VmHWM');
  peakRss = Math.max(peakRss, rssOf(server.pid, 'VmRSS'));
  await stopServerChild(server);

  console.log('\nphase                          clients   throughput        latency');
  for (const [app, baseline] of results) {
    console.log(fmt(app));
    console.log(fmt(baseline));
    const cpu = cpuPerEvent.get(`${app.name} ${app.clients}`) ?? 0;
    console.log(`${''.padEnd(30)}      app/baseline ${(app.eventsPerSecond / baseline.eventsPerSecond).toFixed(2)}   server CPU ${cpu.toFixed(2)} ms/event\n`);
  }
  console.log(`Server peak resident memory: ${peakRss.toFixed(0)} MB sampled (VmHWM ${hwm.toFixed(0)} MB).`);

  const check = createSequelize(appUrl, { poolMax: 2 });
  const verified = await verifyLedger(check);
  await check.close();
  console.log(`Ledger after the bench: ${verified.ok ? 'verified' : 'BROKEN'} (${verified.eventsChecked} events).`);
  if (!verified.ok) exitCode = 1;

  const labels = await benchLabels();
  console.log(`Labels: 1,000 specimen labels in ${labels.ms} ms, ${(labels.bytes / 1024).toFixed(0)} kB PDF, bench process peak ${labels.peakRssMb} MB.`);

  const [, single32, batch] = results;
  const aims = [
    ['32-client single scans ≥ 70 % of baseline', single32![0].eventsPerSecond / single32![1].eventsPerSecond >= 0.7],
    ['32-client single scans p99 < 100 ms', single32![0].p99Ms < 100],
    ['batches ≥ 5,000 events/s', batch![0].eventsPerSecond >= 5000],
    ['server < 250 MB', Math.max(peakRss, hwm) < 250],
  ] as const;
  console.log('\nAims:');
  for (const [aim, met] of aims) console.log(`  ${met ? 'met    ' : 'MISSED '} ${aim}`);
} catch (err) {
  console.error(err);
  exitCode = 1;
} finally {
  cluster?.stop();
  rmSync(tmp, { recursive: true, force: true });
}
process.exit(exitCode);
