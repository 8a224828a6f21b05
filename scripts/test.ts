/**
 * npm test: installs what a fresh machine lacks, starts a throwaway PostgreSQL, migrates a
 * template database from empty, builds the client, runs every test (unit, API, browser) with
 * vitest, removes the cluster (also on failure or Ctrl-C), and ends with "N passed, N failed".
 */
import { spawn } from 'node:child_process';
import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { buildClientIfStale } from './lib/client-build';
import { migrateUp } from './lib/migrate';
import { freePort, provisionDatabase, roleUrl, startCluster, type PgCluster } from './lib/pg-cluster';
import { ensureSystemPackages, NEEDS } from './lib/system-packages';
import { startS3StandIn, type S3StandIn } from './lib/s3-standin';
import { TEST_ROLES, TEST_TEMPLATE_DB } from '../tests/test-env';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');
const artifacts = path.join(root, '.test-artifacts');
const started = Date.now();

ensureSystemPackages([NEEDS.postgresql, NEEDS.chromium, NEEDS.popplerUtils], 'npm test');

const tmp = mkdtempSync(path.join(os.tmpdir(), 'halfmark-test-'));
let cluster: PgCluster | null = null;
let s3: S3StandIn | null = null;
const cleanup = () => {
  cluster?.stop();
  cluster = null;
  void s3?.close();
  s3 = null;
  rmSync(tmp, { recursive: true, force: true });
};
for (const sig of ['SIGINT', 'SIGTERM'] as const) {
  process.on(sig, () => {
    cleanup();
    process.exit(130);
  });
}

interface VitestReport {
  numPassedTests: number;
  numFailedTests: number;
  numPendingTests: number;
  numTodoTests: number;
  numFailedTestSuites: number;
}

let exitCode = 1;
try {
  const superPassword = randomBytes(12).toString('base64url');
  cluster = startCluster({ dir: tmp, port: await freePort(), superPassword, throwaway: true });
  const roles = { database: TEST_TEMPLATE_DB, ...TEST_ROLES };
  await provisionDatabase(cluster.adminUrl(), roles);
  await migrateUp(roleUrl(cluster.port, TEST_TEMPLATE_DB, roles.owner), roleUrl(cluster.port, TEST_TEMPLATE_DB, roles.app));
  // Attachments go to a stand-in S3 server keeping its objects in the run's temp folder.
  s3 = await startS3StandIn({ directory: path.join(tmp, 's3'), bucket: 'halfmark-test' });
  // Browser tests need the built client; a run filtered to other tests skips the build.
  const filters = process.argv.slice(2).filter((a) => !a.startsWith('-'));
  if (filters.length === 0 || filters.some((f) => f.includes('e2e'))) buildClientIfStale(root);
  mkdirSync(artifacts, { recursive: true });
  const report = path.join(tmp, 'vitest.json');

  const args = ['run', '--reporter=default', '--reporter=json', `--outputFile.json=${report}`, ...process.argv.slice(2)];
  exitCode = await new Promise<number>((resolve) => {
    const child = spawn(path.join(root, 'node_modules', '.bin', 'vitest'), args, {
      cwd: root,
      stdio: 'inherit',
      env: {
        ...process.env,
        NODE_ENV: 'test',
        HM_TEST_PG_PORT: String(cluster!.port),
        HM_TEST_ADMIN_URL: cluster!.adminUrl(),
        HM_TEST_PG_DIR: tmp,
        HM_TEST_S3_ENDPOINT: s3!.endpoint,
        HM_TEST_S3_KEY: s3!.env.S3_ACCESS_KEY_ID,
      },
    });
    child.on('exit', (code) => resolve(code ?? 1));
  });

  if (existsSync(report)) {
    const r = JSON.parse(readFileSync(report, 'utf8')) as VitestReport;
    const skipped = r.numPendingTests + r.numTodoTests;
    const failed = r.numFailedTests + (r.numFailedTests === 0 && r.numFailedTestSuites > 0 ? r.numFailedTestSuites : 0);
    console.log(`\nWhole run took ${((Date.now() - started) / 1000).toFixed(1)} s.`);
    console.log(`${r.numPassedTests} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
    if (r.numPassedTests + failed === 0) exitCode = exitCode || 1;
  } else {
    console.log('0 passed, 1 failed');
    exitCode = exitCode || 1;
  }
} catch (err) {
  console.error(err);
  console.log('0 passed, 1 failed');
  exitCode = 1;
} finally {
  cleanup();
}
process.exit(exitCode);
