import { randomBytes } from 'node:crypto';
import { mkdtempSync, rmSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp, createContext } from '../../server/app';
import { loadConfig } from '../../server/config';
import { createSequelize } from '../../server/db';
import { freePort, startCluster } from '../../scripts/lib/pg-cluster';
import { createTestContext, type TestContext } from '../support';
import { TEST_SESSION_SECRET } from '../test-env';

describe('GET /api/health', () => {
  let t: TestContext;
  beforeAll(async () => {
    t = await createTestContext();
  });
  afterAll(() => t.close());

  it('answers 200 with the last applied migration', async () => {
    const res = await request(t.app).get('/api/health').expect(200);
    expect(res.body.ok).toBe(true);
    expect(res.body.db).toBe('up');
    expect(res.body.migration).toMatch(/^\d{14}-[a-z0-9-]+\.ts$/);
  });

  it('answers 503 with ok:false when its database has stopped', async () => {
    // A cluster of its own, so that stopping it leaves the other test files' database alone.
    const dir = mkdtempSync(path.join(os.tmpdir(), 'hm-health-'));
    const cluster = startCluster({ dir, port: await freePort(), superPassword: randomBytes(8).toString('hex'), throwaway: true });
    const sequelize = createSequelize(cluster.adminUrl(), { poolMax: 1 });
    try {
      await sequelize.query(`CREATE TABLE schema_migrations (name text PRIMARY KEY); INSERT INTO schema_migrations VALUES ('20260101000000-x.ts')`);
      const config = loadConfig({ NODE_ENV: 'test', DATABASE_URL: cluster.adminUrl(), SESSION_SECRET: TEST_SESSION_SECRET });
      const app = createApp(createContext(config, sequelize));
      await request(app).get('/api/health').expect(200);
      cluster.stop();
      const res = await request(app).get('/api/health').expect(503);
      expect(res.body).toMatchObject({ ok: false, db: 'down' });
      expect(res.body.error.code).toBe('db_unavailable');
    } finally {
      cluster.stop();
      await sequelize.close().catch(() => undefined);
      rmSync(dir, { recursive: true, force: true });
    }
  });
});

describe('unknown API routes', () => {
  let t: TestContext;
  beforeAll(async () => {
    t = await createTestContext();
  });
  afterAll(() => t.close());

  it('answers 404 in the one error shape', async () => {
    const res = await request(t.app).get('/api/no-such-thing').expect(404);
    expect(res.body.error).toMatchObject({ code: 'not_found' });
    expect(res.body.error.message).toContain('/api/no-such-thing');
  });

  it('answers 400 for a body that is not JSON', async () => {
    const res = await request(t.app).post('/api/health').set('Content-Type', 'application/json').send('{"broken":').expect(400);
    expect(res.body.error.code).toBe('malformed_json');
  });
});
