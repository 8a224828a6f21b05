import { simpleParser } from 'mailparser';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createContext } from '../../server/app';
import { digestHourReached, runRetentionDigest } from '../../server/jobs/retention-digest';
import type { LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { createUser, signIn } from '../factories';
import { countRows } from '../ledger/ledger-fixtures';
import { DAY_MS, retainedOrder, type RetainedOrder } from './disposals-fixtures';

let t: TestContext;
let actor: LedgerActor;
let soon: RetainedOrder;
let later: RetainedOrder;
let clerks: string[];

beforeAll(async () => {
  t = await createTestContext();
  const a = await createUser(t, 'clerk');
  const b = await createUser(t, 'clerk');
  await createUser(t, 'clerk', { active: false });
  clerks = [a.email, b.email];
  actor = { kind: 'user', id: a.id, role: 'clerk' };
  // 30 days after a report 26 days ago: due in about four days. 90 days ahead: outside a 14-day digest.
  soon = await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - 26 * DAY_MS), specimens: 1 });
  later = await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - DAY_MS), retentionDays: 90, specimens: 1 });
  await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - 200 * DAY_MS), specimens: 1 });
});
afterAll(async () => t?.close());

describe('runRetentionDigest', () => {
  it('is sent once a day by exactly one of two servers, to every active clerk, through the stand-in SMTP server', async () => {
    // A second server: its own context (and its own mailer) on the same database.
    const other = createContext(t.config, t.sequelize);
    try {
      const now = new Date();
      const results = await Promise.all([runRetentionDigest(t.ctx, { now }), runRetentionDigest(other, { now })]);
      expect(results.map((r) => r.outcome).sort()).toEqual(['sent', 'skipped']);
      const sent = results.find((r) => r.outcome === 'sent');
      expect(sent).toMatchObject({ dueSoon: 2, dueNow: 2 });
      expect([...(sent?.recipients ?? [])].sort()).toEqual([...clerks].sort());

      const mail = [...(await t.ctx.mailer.outbox!()), ...(await other.mailer.outbox!())];
      expect(mail).toHaveLength(2);
      expect(mail.flatMap((m) => m.to).sort()).toEqual([...clerks].sort());
      const message = await simpleParser(mail[0]?.raw ?? '');
      expect(message.subject).toBe('Retention: 2 items fall due in the next 14 days');
      for (const code of soon.halves) expect(message.text).toContain(code);
      for (const code of later.halves) expect(message.text).not.toContain(code);
      expect(message.text).toContain(`order ${soon.order}, heat ${soon.heat}`);
      expect(message.text).toContain('2 items are already due');

      // A later tick the same day sends nothing more.
      const again = await runRetentionDigest(t.ctx, { now: new Date() });
      expect(again.outcome).toBe('skipped');
      expect(await countRows(t, 'job_runs', `job = 'retention-digest' AND status = 'done'`)).toBe(1);
    } finally {
      await other.mailer.close();
    }
  });

  it('tries again after a failed send: the day’s claim is taken over', async () => {
    await t.owner.query(`INSERT INTO job_runs (job, run_key, status) VALUES ('retention-digest', '2030-01-02', 'failed')`);
    const before = (await t.ctx.mailer.outbox!()).length;
    const result = await runRetentionDigest(t.ctx, { now: new Date('2030-01-02T12:00:00Z') });
    expect(result.outcome).toBe('sent');
    expect((await t.ctx.mailer.outbox!()).length).toBe(before + 2);
  });
});

describe('POST /api/retention/digest', () => {
  it('answers skipped when today’s digest was already sent', async () => {
    const [user] = await t.ctx.models.User.findAll({ where: { email: clerks[0] } });
    const clerk = await signIn(t, user!);
    const res = await clerk.post('/api/retention/digest', {}).expect(200);
    expect(res.body.outcome).toBe('skipped');
  });
});

describe('digestHourReached', () => {
  it('reads the hour on the lab’s wall clock', () => {
    // 2026-07-01T05:30Z is 07:30 in Paris (CEST, UTC+2; from memory) and 01:30 in New York (EDT, UTC-4).
    const now = new Date('2026-07-01T05:30:00Z');
    expect(digestHourReached(now, 'Europe/Paris', 7)).toBe(true);
    expect(digestHourReached(now, 'Europe/Paris', 8)).toBe(false);
    expect(digestHourReached(now, 'America/New_York', 7)).toBe(false);
  });
});
