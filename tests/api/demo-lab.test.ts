import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { verifyLedger } from '../../server/commands/verify-ledger';
import { DEMO_USERS, loadDemoLab } from '../../server/demo/seed';
import { signIn } from '../factories';
import { createTestContext, type TestContext } from '../support';

describe('the demo lab', () => {
  let t: TestContext;
  let printed: string;
  beforeAll(async () => {
    t = await createTestContext();
    printed = await loadDemoLab(t.ctx);
  });
  afterAll(() => t.close());

  it('loads people, specimens in several states, halves and containers through the ledger', async () => {
    expect(printed).toContain('Demo sign-ins');
    const [rows] = await t.sequelize.query(`SELECT kind, state, count(*)::int AS n FROM items GROUP BY 1, 2 ORDER BY 1, 2`);
    const count = (kind: string, state: string) => (rows as { kind: string; state: string; n: number }[]).find((r) => r.kind === kind && r.state === state)?.n ?? 0;
    expect(count('specimen', 'broken')).toBe(2);
    expect(count('specimen', 'measured')).toBe(2);
    expect(count('specimen', 'held')).toBe(1);
    expect(count('specimen', 'registered')).toBe(1);
    expect(count('half', 'retained')).toBe(2);
    expect(count('half', 'binned')).toBe(2);
    expect(count('container', 'active')).toBe(5);
  });

  it('leaves a ledger that verifies', async () => {
    const result = await verifyLedger(t.sequelize);
    expect(result.ok).toBe(true);
    expect(result.eventsChecked).toBeGreaterThan(30);
  });

  it('tells a story the anomaly list finds nothing wrong with (registered before cut, in order)', async () => {
    const auditor = DEMO_USERS.find((u) => u.role === 'auditor')!;
    const user = await t.ctx.models.User.findOne({ where: { email: auditor.email } });
    const agent = await signIn(t, user!, auditor.password);
    const res = await agent.get('/api/anomalies').expect(200);
    expect(res.body.items).toEqual([]);
    expect(res.body.itemsChecked).toBeGreaterThan(10);
  });

  it('GET /api/floor counts items by state and the work waiting at each station', async () => {
    const auditor = await t.ctx.models.User.findOne({ where: { role: 'auditor' } });
    const agent = await signIn(t, auditor!, DEMO_USERS.find((u) => u.role === 'auditor')!.password);
    const res = await agent.get('/api/floor').expect(200);
    const count = (kind: string, state: string) => res.body.states.find((s: { kind: string; state: string }) => s.kind === kind && s.state === state)?.count;
    expect(count('specimen', 'broken')).toBe(2);
    expect(count('half', 'retained')).toBe(2);
    const at = (code: string) => res.body.stations.find((s: { code: string }) => s.code === code);
    // The gauge holds the two measured specimens; the bins hold the two binned halves; the saw the held one.
    expect(at('GAUGE-1')).toMatchObject({ count: 2 });
    expect(at('BINS-1')).toMatchObject({ count: 2 });
    expect(at('SAW-1')).toMatchObject({ count: 1 });
    expect(at('STORE-1')).toMatchObject({ count: 0, oldestSince: null });
    expect(res.body.eventsLast24h).toBeGreaterThan(30);
  });

  it('lets each demo person sign in with the printed password', async () => {
    for (const u of DEMO_USERS) {
      const user = await t.ctx.models.User.findOne({ where: { email: u.email } });
      const agent = await signIn(t, user!, u.password);
      const me = await agent.get('/api/auth/me').expect(200);
      expect(me.body.user.role).toBe(u.role);
    }
  });
});
