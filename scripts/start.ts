/**
 * npm start: brings up the embedded PostgreSQL (unless DATABASE_URL is set), migrates it, loads
 * the demo lab into an empty database, builds the client when stale, and serves everything on
 * 127.0.0.1. Ctrl-C stops the app, then the database.
 */
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { ConfigError, loadConfig } from '../server/config';
import { listen, type RunningServer } from '../server/index';
import { buildClientIfStale } from './lib/client-build';
import { prepareDatabase, type PreparedDatabase } from './lib/embedded-db';
import { migrateUp } from './lib/migrate';
import { loadDemoIfEmpty } from './lib/demo';
import { loadDemoUsers } from './lib/demo-users';
import { startMailStandIn } from './lib/smtp-stand-in';
import { startObjectStandIn, type S3StandIn } from './lib/s3-standin';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const dataDir = path.resolve(root, process.env.DATA_DIR ?? '.data');
const started = Date.now();

let db: PreparedDatabase | null = null;
let running: RunningServer | null = null;
let mail: Awaited<ReturnType<typeof startMailStandIn>> = null;
let objects: S3StandIn | null = null;
let stopping = false;

async function stop(signal: string): Promise<void> {
  if (stopping) return;
  stopping = true;
  console.log(`\n${signal}: stopping Halfmark …`);
  try {
    await running?.close();
    await mail?.server.close();
    await objects?.close();
  } finally {
    db?.cluster?.stop();
    console.log('Stopped.');
    process.exit(0);
  }
}
process.on('SIGINT', () => void stop('SIGINT'));
process.on('SIGTERM', () => void stop('SIGTERM'));

try {
  db = await prepareDatabase(dataDir);
  mail = await startMailStandIn(dataDir);
  objects = await startObjectStandIn(dataDir);
  const config = loadConfig({
    NODE_ENV: 'production',
    ...process.env,
    ...mail?.env,
    ...objects?.env,
    DATABASE_URL: db.appUrl,
    MIGRATION_DATABASE_URL: db.ownerUrl,
    SESSION_SECRET: db.sessionSecret,
    DATA_DIR: dataDir,
  });
  const applied = await migrateUp(db.ownerUrl, db.appUrl);
  if (applied.length) console.log(`Migrations applied: ${applied.length}`);
  const demo = await loadDemoIfEmpty(config);
  const demoUsers = await loadDemoUsers(config);
  buildClientIfStale(root);
  running = await listen(config);
  console.log(`\nHalfmark is running at ${running.url}  (ready in ${((Date.now() - started) / 1000).toFixed(1)} s)`);
  console.log(db.cluster ? `Database: private PostgreSQL in ${db.cluster.dir} on 127.0.0.1:${db.cluster.port}` : 'Database: DATABASE_URL');
  console.log(mail ? `Mail: stand-in SMTP on ${mail.server.host}:${mail.server.port}; nothing is delivered, managers read it on the Outbox page (kept in ${mail.env.SMTP_OUTBOX_DIR})` : `Mail: SMTP via ${config.SMTP_HOST}:${config.SMTP_PORT}`);
  console.log(objects ? `Attachments: stand-in S3 on ${objects.endpoint}, objects kept in ${objects.directory}` : `Attachments: S3 bucket ${config.S3_BUCKET ?? 'halfmark-attachments'}`);
  if (demo) console.log(demo);
  // The demo loader may already have printed the sign-ins while adding the people.
  if (demoUsers && !demo?.includes(demoUsers)) console.log(demoUsers);
  console.log('Press Ctrl-C to stop.');
} catch (err) {
  console.error(err instanceof ConfigError ? err.message : err);
  await running?.close();
  db?.cluster?.stop();
  process.exit(1);
}
