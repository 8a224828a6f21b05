import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createSessionUsers, SESSION_USER_TTL_MS } from '../../server/auth/session-users';
import { createUser, signIn, signedInAs } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t.close());

/** Counts the SELECTs on users that a piece of work sends. */
async function usersQueries(work: () => Promise<unknown>): Promise<number> {
  let count = 0;
  const hook = (sql: string) => {
    if (/FROM "users"/.test(sql)) count++;
  };
  const options = (t.sequelize as unknown as { options: { logging?: unknown } }).options;
  const before = options.logging;
  options.logging = hook;
  try {
    await work();
  } finally {
    options.logging = before;
  }
  return count;
}

describe('session users', () => {
  it('reads a signed-in user once for a burst of requests, not once per request', async () => {
    const agent = await signedInAs(t, 'technician');
    const queries = await usersQueries(async () => {
      for (let i = 0; i < 10; i++) await agent.get('/api/auth/me').expect(200);
    });
    expect(queries).toBeLessThanOrEqual(1);
  });

  it('shares one query among concurrent requests of the same user', async () => {
    const user = await createUser(t, 'machinist');
    const agent = await signIn(t, user);
    t.ctx.sessionUsers.forget();
    const queries = await usersQueries(() => Promise.all(Array.from({ length: 8 }, () => agent.get('/api/auth/me').expect(200))));
    expect(queries).toBe(1);
  });

  it('ends a deactivated user’s session on the very next request', async () => {
    const manager = await signedInAs(t, 'manager');
    const user = await createUser(t, 'clerk');
    const agent = await signIn(t, user);
    await agent.get('/api/auth/me').expect(200);
    await manager.patch(`/api/users/${user.id}`, { active: false }).expect(200);
    await agent.get('/api/auth/me').expect(401);
  });

  it('sees a change another server made once the entry is older than the time to live', async () => {
    let clock = 1_000_000;
    const users = createSessionUsers(t.ctx.models.User, () => clock);
    const user = await createUser(t, 'auditor');
    expect((await users.get(user.id))?.active).toBe(true);
    // Another process deactivates the user without going through this process's model.
    await t.sequelize.query('UPDATE users SET active = false WHERE id = $1', { bind: [user.id] });
    clock += SESSION_USER_TTL_MS - 1;
    expect((await users.get(user.id))?.active).toBe(true);
    clock += 2;
    expect((await users.get(user.id))?.active).toBe(false);
  });

  it('answers null for an unknown user and forgets a failed lookup', async () => {
    const users = createSessionUsers(t.ctx.models.User);
    expect(await users.get(987_654)).toBeNull();
    const broken = createSessionUsers(t.ctx.models.User);
    const original = t.ctx.models.User.findByPk.bind(t.ctx.models.User);
    let calls = 0;
    t.ctx.models.User.findByPk = (async (...args: Parameters<typeof original>) => {
      calls++;
      if (calls === 1) throw new Error('connection lost');
      return original(...args);
    }) as typeof original;
    try {
      await expect(broken.get(1)).rejects.toThrow('connection lost');
      await broken.get(1);
      expect(calls).toBe(2);
    } finally {
      t.ctx.models.User.findByPk = original;
    }
  });
});
