/**
 * npm run dev: the embedded database and the API server on PORT (4870), plus Vite's dev server
 * on 5173 with hot reload, proxying /api to the API. Ctrl-C stops all three.
 */
import { spawn } from 'node:child_process';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { loadConfig } from '../server/config';
import { listen } from '../server/index';
import { prepareDatabase } from './lib/embedded-db';
import { migrateUp } from './lib/migrate';
import { loadDemoIfEmpty } from './lib/demo';
import { startObjectStandIn } from './lib/s3-standin';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const dataDir = path.resolve(root, process.env.DATA_DIR ?? '.data');

const db = await prepareDatabase(dataDir);
const objects = await startObjectStandIn(dataDir);
const config = loadConfig({
  ...process.env,
  ...objects?.env,
  NODE_ENV: 'development',
  DATABASE_URL: db.appUrl,
  MIGRATION_DATABASE_URL: db.ownerUrl,
  SESSION_SECRET: db.sessionSecret,
  DATA_DIR: dataDir,
});
await migrateUp(db.ownerUrl, db.appUrl);
const demo = await loadDemoIfEmpty(config);
if (demo) console.log(demo);
const api = await listen(config);
console.log(`API at ${api.url}`);
const vite = spawn(path.join(root, 'node_modules', '.bin', 'vite'), ['--port', '5173', '--strictPort'], {
  cwd: root,
  stdio: 'inherit',
  env: { ...process.env, PORT: String(config.PORT) },
});

let stopping = false;
async function stop(): Promise<void> {
  if (stopping) return;
  stopping = true;
  vite.kill('SIGTERM');
  await api.close();
  await objects?.close();
  db.cluster?.stop();
  process.exit(0);
}
process.on('SIGINT', () => void stop());
process.on('SIGTERM', () => void stop());
vite.on('exit', () => void stop());
