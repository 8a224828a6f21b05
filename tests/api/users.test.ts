import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createUser, signIn, signedInAs, TEST_PASSWORD, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
let manager: SignedInAgent;
beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
  for (const [name, role] of [['Zora Quill', 'auditor'], ['Ansel Birch', 'machinist'], ['Mina Ferrow', 'technician']] as const) {
    await createUser(t, role, { name, email: `${name.split(' ')[0]!.toLowerCase()}@lab.example` });
  }
});
afterAll(() => t.close());

describe('GET /api/users', () => {
  it('searches, sorts and pages on the server', async () => {
    const all = await manager.get('/api/users?sort=name&pageSize=2&page=1').expect(200);
    expect(all.body.total).toBe(4);
    expect(all.body.items.map((u: { name: string }) => u.name)).toEqual(['Ansel Birch', 'Mina Ferrow']);
    const desc = await manager.get('/api/users?sort=-name&pageSize=1').expect(200);
    expect(desc.body.items[0].name).toMatch(/^Zora|^Test manager/);
    const q = await manager.get('/api/users?q=zora').expect(200);
    expect(q.body.items.map((u: { email: string }) => u.email)).toEqual(['zora@lab.example']);
    const byRole = await manager.get('/api/users?role=machinist').expect(200);
    expect(byRole.body.total).toBe(1);
  });

  it('answers 422 for an unknown sort or role', async () => {
    const res = await manager.get('/api/users?sort=password&role=wizard').expect(422);
    expect(res.body.error.details.map((d: { path: string }) => d.path).sort()).toEqual(['role', 'sort']);
  });

  it('never shows password or PIN hashes', async () => {
    const res = await manager.get('/api/users').expect(200);
    expect(JSON.stringify(res.body)).not.toMatch(/argon2|passwordHash|pinHash/);
  });
});

describe('PATCH /api/users/:id', () => {
  it('changes the role, which the next request already sees', async () => {
    const user = await createUser(t, 'machinist');
    const agent = await signIn(t, user);
    await manager.patch(`/api/users/${user.id}`, { role: 'technician' }).expect(200);
    const me = await agent.get('/api/auth/me').expect(200);
    expect(me.body.user.role).toBe('technician');
    expect(me.body.permissions).toContain('results.write');
  });

  it('deactivates someone and ends their sessions', async () => {
    const user = await createUser(t, 'clerk');
    const agent = await signIn(t, user);
    await manager.patch(`/api/users/${user.id}`, { active: false }).expect(200);
    await agent.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(401);
  });

  it('answers 409 when a manager would demote or deactivate themself', async () => {
    const res = await manager.patch(`/api/users/${manager.user.id}`, { active: false }).expect(409);
    expect(res.body.error.code).toBe('self_change');
  });

  it('answers 422 for an unknown role and changes nothing', async () => {
    const user = await createUser(t, 'auditor');
    await manager.patch(`/api/users/${user.id}`, { role: 'boss' }).expect(422);
    expect((await t.ctx.models.User.findByPk(user.id))!.role).toBe('auditor');
  });

  it('answers 404 for an unknown id', async () => {
    await manager.patch('/api/users/99999', { name: 'Nobody' }).expect(404);
  });
});

describe('POST /api/users/:id/unlock', () => {
  it('lets a locked-out person sign in again', async () => {
    const user = await createUser(t, 'technician');
    for (let i = 0; i < 5; i++) await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'wrong' });
    const locked = await manager.get(`/api/users/${user.id}`).expect(200);
    expect(locked.body.locked).toBe(true);
    await manager.post(`/api/users/${user.id}/unlock`).expect(200);
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(200);
  });
});

describe('POST /api/auth/password', () => {
  it('changes the password, keeps this session and ends the others', async () => {
    const user = await createUser(t, 'machinist');
    const here = await signIn(t, user);
    const there = await signIn(t, user);
    await here.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'a different long password' }).expect(200);
    await here.get('/api/auth/me').expect(200);
    await there.get('/api/auth/me').expect(401);
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: 'a different long password' }).expect(200);
  });

  it('answers 422 for a short new password or a wrong current one, and changes nothing', async () => {
    const user = await createUser(t, 'clerk');
    const agent = await signIn(t, user);
    const short = await agent.post('/api/auth/password', { currentPassword: TEST_PASSWORD, newPassword: 'elevenchars' }).expect(422);
    expect(short.body.error.details[0]).toMatchObject({ path: 'newPassword', message: expect.stringMatching(/12 characters/) });
    const wrong = await agent.post('/api/auth/password', { currentPassword: 'nope', newPassword: 'a different long password' }).expect(422);
    expect(wrong.body.error.details[0].path).toBe('currentPassword');
    await request(t.app).post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(200);
  });
});

describe('PUT /api/auth/pin', () => {
  it('stores a 4–8 digit PIN hashed with argon2id, and refuses others', async () => {
    const user = await createUser(t, 'technician');
    const agent = await signIn(t, user);
    await agent.put('/api/auth/pin', { password: TEST_PASSWORD, pin: '12a4' }).expect(422);
    await agent.put('/api/auth/pin', { password: TEST_PASSWORD, pin: '123456789' }).expect(422);
    const ok = await agent.put('/api/auth/pin', { password: TEST_PASSWORD, pin: '4821' }).expect(200);
    expect(ok.body.hasPin).toBe(true);
    const [rows] = await t.owner.query('SELECT pin_hash FROM users WHERE id = $1', { bind: [user.id] });
    expect((rows as { pin_hash: string }[])[0]!.pin_hash).toMatch(/^\$argon2id\$/);
    await agent.delete('/api/auth/pin').expect(200);
  });
});
