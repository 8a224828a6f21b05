import request from 'supertest';
import jwt from 'jsonwebtoken';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROLE_PERMISSIONS } from '../../shared/permissions';
import { createUser, signIn, TEST_PASSWORD } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
beforeAll(async () => {
  t = await createTestContext();
});
afterAll(() => t.close());

describe('POST /api/auth/login', () => {
  it('signs in with the right pair and sets an httpOnly, SameSite session cookie', async () => {
    const user = await createUser(t, 'technician');
    const res = await request(t.app).post('/api/auth/login').send({ email: user.email.toUpperCase(), password: TEST_PASSWORD }).expect(200);
    expect(res.body.user).toMatchObject({ email: user.email, role: 'technician' });
    expect(res.body.user.passwordHash).toBeUndefined();
    expect(res.body.permissions).toEqual(ROLE_PERMISSIONS.technician);
    const cookies = ([] as string[]).concat(res.headers['set-cookie']);
    const session = cookies.find((c) => c.startsWith('hm_session='))!;
    expect(session).toMatch(/HttpOnly/);
    expect(session).toMatch(/SameSite=Strict/);
  });

  it('answers 401 with one message for a wrong password and for an unknown address', async () => {
    const user = await createUser(t, 'clerk');
    const wrong = await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'nope' }).expect(401);
    const unknown = await request(t.app).post('/api/auth/login').send({ email: 'nobody@lab.example', password: 'nope' }).expect(401);
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
  });

  it('answers 422 naming the field for a malformed e-mail', async () => {
    const res = await request(t.app).post('/api/auth/login').send({ email: 'not-an-email', password: 'x' }).expect(422);
    expect(res.body.error.details).toEqual([expect.objectContaining({ path: 'email' })]);
  });

  it('locks the account after five wrong passwords, with a clear message, even for the right password', async () => {
    const user = await createUser(t, 'machinist');
    for (let i = 0; i < 4; i++) await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'wrong' }).expect(401);
    const fifth = await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'wrong' }).expect(429);
    expect(fifth.body.error.code).toBe('locked');
    const right = await request(t.app).post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(429);
    expect(right.body.error.message).toMatch(/locked/);
  });

  it('refuses a deactivated user', async () => {
    const user = await createUser(t, 'auditor', { active: false });
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(401);
  });
});

describe('GET /api/auth/me', () => {
  it('answers 401 for nobody', async () => {
    await request(t.app).get('/api/auth/me').expect(401);
  });

  it('answers who I am and what my role may do', async () => {
    const agent = await signIn(t, await createUser(t, 'auditor'));
    const res = await agent.get('/api/auth/me').expect(200);
    expect(res.body.user.role).toBe('auditor');
    expect(res.body.permissions).not.toContain('events.record');
  });

  it('refuses a tampered session token and an expired one', async () => {
    const user = await createUser(t, 'manager');
    const forged = jwt.sign({ ver: 0 }, 'some-other-secret-that-is-long-enough-000', { subject: String(user.id), expiresIn: 600 });
    const a = await request(t.app).get('/api/auth/me').set('Cookie', `hm_session=${forged}`).expect(401);
    expect(a.body.error.code).toBe('session_invalid');
    const expired = jwt.sign({ ver: 0, iat: Math.floor(Date.now() / 1000) - 7200, exp: Math.floor(Date.now() / 1000) - 3600 }, t.config.SESSION_SECRET, { subject: String(user.id) });
    await request(t.app).get('/api/auth/me').set('Cookie', `hm_session=${expired}`).expect(401);
  });
});

describe('POST /api/auth/logout', () => {
  it('clears the session cookies', async () => {
    const agent = await signIn(t, await createUser(t, 'clerk'));
    await agent.post('/api/auth/logout').expect(204);
    await agent.get('/api/auth/me').expect(401);
  });
});

describe('cross-site request protection', () => {
  it('refuses a cookie-authenticated write without the CSRF header, and with a wrong one', async () => {
    const agent = await signIn(t, await createUser(t, 'manager'));
    const missing = await request(t.app).post('/api/users').set('Cookie', agent.cookie).send({ email: 'x@lab.example', name: 'X', role: 'clerk' }).expect(403);
    expect(missing.body.error.details).toEqual({ reason: 'csrf' });
    await request(t.app).post('/api/users').set('Cookie', agent.cookie).set('X-CSRF-Token', 'guess').send({ email: 'x@lab.example', name: 'X', role: 'clerk' }).expect(403);
    const [rows] = await t.owner.query(`SELECT count(*)::int AS n FROM users WHERE email = 'x@lab.example'`);
    expect((rows as { n: number }[])[0]!.n).toBe(0);
  });
});

describe('sign-in rate limit', () => {
  it('answers 429 rate_limited once an address goes past the configured limit', async () => {
    const { createApp, createContext } = await import('../../server/app');
    const app = createApp(createContext({ ...t.config, LOGIN_RATE_LIMIT_MAX: 3 }, t.sequelize));
    for (let i = 0; i < 3; i++) await request(app).post('/api/auth/login').send({ email: 'nobody@lab.example', password: 'x' }).expect(401);
    const res = await request(app).post('/api/auth/login').send({ email: 'nobody@lab.example', password: 'x' }).expect(429);
    expect(res.body.error.code).toBe('rate_limited');
    expect(res.headers['ratelimit-policy']).toBeDefined();
  });

  it('takes about as long for an unknown address as for a known one (a dummy argon2 check runs)', async () => {
    const user = await createUser(t, 'clerk');
    const time = async (email: string) => {
      const start = performance.now();
      await request(t.app).post('/api/auth/login').send({ email, password: 'wrong password' }).expect(401);
      return performance.now() - start;
    };
    await time('warm-up@lab.example');
    const known = await time(user.email);
    const unknown = await time('nobody-at-all@lab.example');
    // argon2id verification dominates both; without the dummy check the unknown case would be a few ms.
    expect(unknown).toBeGreaterThan(known * 0.3);
  });
});

describe('README demo sign-ins', () => {
  it('lists every demo account with its password, as the seed makes them', async () => {
    const { readFileSync } = await import('node:fs');
    const { DEMO_USERS } = await import('../../server/demo/seed');
    const readme = readFileSync(new URL('../../README.md', import.meta.url), 'utf8');
    for (const u of DEMO_USERS) expect(readme).toContain(`| \`${u.email}\` | \`${u.password}\` |`);
  });
});
