import jwt from 'jsonwebtoken';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it, vi } from 'vitest';
import { badgeCode, specimenCode } from '../../shared/domain/codes';
import type { Role } from '../../shared/permissions';
import { hashPassword } from '../../server/auth/passwords';
import { signOperatorToken } from '../../server/auth/operator-token';
import { registerItem } from '../../server/commands/record-event';
import type { User } from '../../server/models/user';
import { createUser, TEST_PASSWORD } from '../factories';
import { createTestContext, type TestContext } from '../support';

let t: TestContext;
let app: TestContext['app'];

async function agentFor(user: User) {
  const agent = request.agent(app);
  const res = await agent.post('/api/auth/login').send({ email: user.email, password: TEST_PASSWORD }).expect(200);
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const csrf = cookies.map((c) => /^hm_csrf=([^;]+)/.exec(c)?.[1]).find(Boolean) ?? '';
  return {
    post: (path: string, body: object, headers: Record<string, string> = {}) => agent.post(path).set({ 'X-CSRF-Token': csrf, ...headers }).send(body),
  };
}

async function operator(role: Role, pin = '4821'): Promise<{ user: User; badge: string; pin: string }> {
  const user = await createUser(t, role);
  const badge = badgeCode();
  await user.update({ badgeCode: badge, pinHash: await hashPassword(pin) });
  return { user, badge, pin };
}

beforeAll(async () => {
  t = await createTestContext();
  app = t.app;
});
afterAll(() => t.close());

describe('POST /api/auth/station-operator', () => {
  it('answers a token naming the badge holder for the right badge and PIN', async () => {
    const station = await agentFor(await createUser(t, 'technician'));
    const op = await operator('clerk');
    const res = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(200);
    expect(res.body.operator).toEqual({ id: op.user.id, name: op.user.name, role: 'clerk' });
    expect(typeof res.body.token).toBe('string');
    // The token lasts about a shift, not a session's half hour and not for days.
    const hours = (Date.parse(res.body.expiresAt) - Date.now()) / 3_600_000;
    expect(hours).toBeGreaterThan(11);
    expect(hours).toBeLessThanOrEqual(12);
  });

  it('accepts the badge typed in any case and with spaces for hyphens', async () => {
    const station = await agentFor(await createUser(t, 'technician'));
    const op = await operator('machinist');
    const typed = op.badge.toLowerCase().replace(/-/g, ' ');
    await station.post('/api/auth/station-operator', { badgeCode: typed, pin: op.pin }).expect(200);
  });

  it('answers 401 with one message for a wrong PIN and for an unknown badge (a found badge alone is not enough)', async () => {
    const station = await agentFor(await createUser(t, 'technician'));
    const op = await operator('technician');
    const wrong = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: '0000' }).expect(401);
    const unknown = await station.post('/api/auth/station-operator', { badgeCode: badgeCode(), pin: op.pin }).expect(401);
    expect(wrong.body.error.code).toBe('operator_refused');
    expect(wrong.body.error.message).toBe(unknown.body.error.message);
    expect(wrong.body).not.toHaveProperty('token');
  });

  it('answers 422 when the badge or the PIN is missing (a PIN alone is not enough)', async () => {
    const station = await agentFor(await createUser(t, 'technician'));
    const op = await operator('technician');
    const noBadge = await station.post('/api/auth/station-operator', { pin: op.pin }).expect(422);
    expect(noBadge.body.error.details).toEqual([expect.objectContaining({ path: 'badgeCode' })]);
    const notBadge = await station.post('/api/auth/station-operator', { badgeCode: specimenCode(26, 157), pin: op.pin }).expect(422);
    expect(notBadge.body.error.details[0].message).toContain('expected a badge code');
    const shortPin = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: '12' }).expect(422);
    expect(shortPin.body.error.details).toEqual([expect.objectContaining({ path: 'pin', message: 'A PIN is 4 to 8 digits.' })]);
  });

  it('locks the badge after five wrong PINs, then refuses even the right PIN with 429', async () => {
    const station = await agentFor(await createUser(t, 'technician'));
    const op = await operator('clerk');
    for (let i = 0; i < 4; i++) {
      await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: '9999' }).expect(401);
    }
    const fifth = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: '9999' }).expect(429);
    expect(fifth.body.error.code).toBe('locked');
    const right = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(429);
    expect(right.body.error.message).toMatch(/locked/);
  });

  it('answers 403 for an auditor\'s badge: that role may not record events', async () => {
    const station = await agentFor(await createUser(t, 'technician'));
    const op = await operator('auditor');
    await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(403);
  });

  it('answers 401 without a signed-in station', async () => {
    const op = await operator('technician');
    await request(app).post('/api/auth/station-operator').send({ badgeCode: op.badge, pin: op.pin }).expect(401);
  });
});

describe('X-Operator-Token on event posts', () => {
  async function newSpecimen(by: User): Promise<string> {
    const code = specimenCode(26, 10_000 + Math.floor(Math.random() * 80_000));
    await registerItem(t.ctx, { kind: 'specimen', code }, { actor: { kind: 'user', id: by.id, role: by.role } });
    return code;
  }

  async function actorOf(idempotencyKey: string): Promise<number | null> {
    const [rows] = await t.owner.query('SELECT actor_user_id FROM custody_events WHERE idempotency_key = $1', { bind: [idempotencyKey] });
    return (rows as { actor_user_id: number | null }[])[0]?.actor_user_id ?? null;
  }

  const cut = (itemCode: string) => ({ idempotencyKey: crypto.randomUUID(), type: 'cut', itemCode, occurredAt: new Date().toISOString() });

  it('attributes the event to the operator, not to the station\'s signed-in user', async () => {
    const stationUser = await createUser(t, 'technician');
    const station = await agentFor(stationUser);
    const op = await operator('machinist');
    const code = await newSpecimen(stationUser);
    const { body } = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(200);
    const event = cut(code);
    await station.post('/api/events', event, { 'X-Operator-Token': body.token }).expect(201);
    expect(await actorOf(event.idempotencyKey)).toBe(op.user.id);
  });

  it('attributes the event to the signed-in user when no operator token is sent', async () => {
    const stationUser = await createUser(t, 'technician');
    const station = await agentFor(stationUser);
    const event = cut(await newSpecimen(stationUser));
    await station.post('/api/events', event).expect(201);
    expect(await actorOf(event.idempotencyKey)).toBe(stationUser.id);
  });

  it('answers 401 for a token issued to another station session, and records nothing', async () => {
    const op = await operator('machinist');
    const first = await agentFor(await createUser(t, 'technician'));
    const otherUser = await createUser(t, 'technician');
    const other = await agentFor(otherUser);
    const { body } = await first.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(200);
    const event = cut(await newSpecimen(otherUser));
    const res = await other.post('/api/events', event, { 'X-Operator-Token': body.token }).expect(401);
    expect(res.body.error.code).toBe('operator_token_invalid');
    expect(await actorOf(event.idempotencyKey)).toBeNull();
  });

  it('answers 401 once the operator\'s PIN was changed, and for an expired token', async () => {
    const stationUser = await createUser(t, 'technician');
    const station = await agentFor(stationUser);
    const op = await operator('machinist');
    const { body } = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(200);
    await op.user.update({ pinHash: await hashPassword('7777') });
    await station.post('/api/events', cut(await newSpecimen(stationUser)), { 'X-Operator-Token': body.token }).expect(401);

    const fresh = await op.user.reload();
    // Issued thirteen hours ago, so it ran out an hour ago (tokens last twelve).
    const now = Date.now();
    const clock = vi.spyOn(Date, 'now').mockReturnValue(now - 13 * 3_600_000);
    const { token } = signOperatorToken(t.config.SESSION_SECRET, fresh, stationUser.id);
    clock.mockRestore();
    const expired = await station.post('/api/events', cut(await newSpecimen(stationUser)), { 'X-Operator-Token': token }).expect(401);
    expect(expired.body.error.message).toMatch(/expired/);
  });

  it('refuses a session cookie\'s token as an operator token and an operator token as a session', async () => {
    const stationUser = await createUser(t, 'technician');
    const station = await agentFor(stationUser);
    const op = await operator('machinist');
    const { body } = await station.post('/api/auth/station-operator', { badgeCode: op.badge, pin: op.pin }).expect(200);
    // Signed with a key derived from the session secret, so it never passes as a session cookie.
    const asSession = await request(app).get('/api/auth/me').set('Cookie', `hm_session=${body.token}`);
    expect(asSession.status).toBe(401);
    const forged = jwt.sign({ ver: 0, pin: 'x', tab: stationUser.id }, t.config.SESSION_SECRET, { subject: String(op.user.id), audience: 'halfmark-station-operator' });
    await station.post('/api/events', cut(await newSpecimen(stationUser)), { 'X-Operator-Token': forged }).expect(401);
  });
});
