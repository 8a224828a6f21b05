import { simpleParser } from 'mailparser';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, signedInAs, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
let manager: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
});
afterAll(async () => {
  await t.ctx.mailer.close();
  await t.close();
});

/** The newest message the stand-in SMTP server received for an address, parsed from its raw source. */
async function lastMailTo(address: string) {
  const all = await t.ctx.mailer.outbox!();
  const raw = all.filter((m) => m.to.includes(address)).at(-1);
  if (!raw) throw new Error(`no mail for ${address}`);
  return simpleParser(raw.raw);
}

/** The token from the set-password link in a message's text. */
function linkToken(text: string): string {
  const m = /\/set-password\?token=([A-Za-z0-9_-]+)/.exec(text);
  if (!m) throw new Error('no link in the message');
  return m[1]!;
}

describe('POST /api/users (invitation by e-mail)', () => {
  it('sends a link through SMTP that sets the password once and signs the person in', async () => {
    const res = await manager.post('/api/users', { email: 'Ada.Invited@Lab.Example', name: 'Ada Invited', role: 'technician' }).expect(201);
    expect(res.body).toMatchObject({ email: 'ada.invited@lab.example', invited: true, role: 'technician' });
    expect(res.body.badgeCode).toMatch(/^U-[2-9A-HJ-NP-Z]{6}-.$/);

    const mail = await lastMailTo('ada.invited@lab.example');
    expect(mail.subject).toBe('You are invited to Halfmark');
    expect(mail.text).toContain('expires in 72 hours');
    const token = linkToken(mail.text ?? '');

    const info = await request(t.app).post('/api/auth/link').send({ token }).expect(200);
    expect(info.body).toMatchObject({ purpose: 'invite', email: 'ada.invited@lab.example' });

    const short = await request(t.app).post('/api/auth/set-password').send({ token, password: 'short' }).expect(422);
    expect(short.body.error.details).toEqual([expect.objectContaining({ path: 'password' })]);

    const set = await request(t.app).post('/api/auth/set-password').send({ token, password: 'a long enough new password' }).expect(200);
    expect(set.body.user.invited).toBe(false);
    expect(([] as string[]).concat(set.headers['set-cookie']).some((c) => c.startsWith('hm_session='))).toBe(true);
    await request(t.app).post('/api/auth/login').send({ email: 'ada.invited@lab.example', password: 'a long enough new password' }).expect(200);

    const again = await request(t.app).post('/api/auth/set-password').send({ token, password: 'another long password' }).expect(410);
    expect(again.body.error.code).toBe('link_used');
    // The reused link changed nothing: the first password still works.
    await request(t.app).post('/api/auth/login').send({ email: 'ada.invited@lab.example', password: 'a long enough new password' }).expect(200);
  });

  it('refuses an expired link with a clear message and changes nothing', async () => {
    await manager.post('/api/users', { email: 'late@lab.example', name: 'Late Comer', role: 'clerk' }).expect(201);
    const token = linkToken((await lastMailTo('late@lab.example')).text ?? '');
    await t.owner.query(`UPDATE one_time_tokens SET expires_at = now() - interval '1 minute' WHERE user_id = (SELECT id FROM users WHERE email = 'late@lab.example')`);
    const res = await request(t.app).post('/api/auth/set-password').send({ token, password: 'a long enough new password' }).expect(410);
    expect(res.body.error).toMatchObject({ code: 'link_expired' });
    expect(res.body.error.message).toMatch(/expired/);
    const [rows] = await t.owner.query(`SELECT password_hash FROM users WHERE email = 'late@lab.example'`);
    expect((rows as { password_hash: string | null }[])[0]!.password_hash).toBeNull();
  });

  it('answers 404 for a tampered link', async () => {
    const res = await request(t.app).post('/api/auth/set-password').send({ token: 'x'.repeat(43), password: 'a long enough new password' }).expect(404);
    expect(res.body.error.message).toMatch(/not valid/);
  });

  it('answers 422 for a malformed e-mail and an unknown role, and 409 for a taken address', async () => {
    const bad = await manager.post('/api/users', { email: 'not-mail', name: 'X', role: 'wizard' }).expect(422);
    expect(bad.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['email', 'role']);
    const taken = await manager.post('/api/users', { email: manager.user.email.toUpperCase(), name: 'Copy', role: 'clerk' }).expect(409);
    expect(taken.body.error.code).toBe('duplicate');
  });
});

describe('POST /api/auth/password-reset', () => {
  it('gives the same answer for a known and an unknown address, and mails only the known one', async () => {
    const user = await createUser(t, 'machinist');
    const before = (await t.ctx.mailer.outbox!()).length;
    const known = await request(t.app).post('/api/auth/password-reset').send({ email: user.email }).expect(202);
    const unknown = await request(t.app).post('/api/auth/password-reset').send({ email: 'nobody-here@lab.example' }).expect(202);
    expect(known.body).toEqual(unknown.body);
    const after = await t.ctx.mailer.outbox!();
    expect(after.length).toBe(before + 1);
    expect(after.at(-1)!.to).toEqual([user.email]);
  });

  it('resets through the e-mailed link, ends other sessions, and the link works once', async () => {
    const user = await createUser(t, 'clerk');
    const { signIn } = await import('../factories');
    const elsewhere = await signIn(t, user);
    await request(t.app).post('/api/auth/password-reset').send({ email: user.email }).expect(202);
    const mail = await lastMailTo(user.email);
    expect(mail.subject).toBe('Reset your Halfmark password');
    const token = linkToken(mail.text ?? '');
    const info = await request(t.app).post('/api/auth/link').send({ token }).expect(200);
    expect(info.body.purpose).toBe('reset');
    await request(t.app).post('/api/auth/set-password').send({ token, password: 'a brand new long password' }).expect(200);
    await elsewhere.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'a brand new long password' }).expect(200);
    const reused = await request(t.app).post('/api/auth/link').send({ token }).expect(410);
    expect(reused.body.error.code).toBe('link_used');
  });
});

describe('GET /api/outbox', () => {
  it('lists what the stand-in received, newest first, for a manager', async () => {
    const res = await manager.get('/api/outbox').expect(200);
    expect(res.body.items.length).toBeGreaterThan(0);
    expect(res.body.items[0]).toEqual(expect.objectContaining({ subject: expect.any(String), to: expect.any(Array), text: expect.any(String) }));
  });
});
