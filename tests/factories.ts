import { randomBytes } from 'node:crypto';
import request from 'supertest';
import type { Role } from '../shared/permissions';
import { hashPassword } from '../server/auth/passwords';
import type { User } from '../server/models/user';
import type { Station } from '../server/models/station';
import type { InstrumentToken } from '../server/models/instrument-token';
import { hashToken } from '../server/middleware/auth';
import type { TestContext } from './support';

export const TEST_PASSWORD = 'correct horse battery staple';

/** Creates a user of a role with a known password. */
export async function createUser(t: TestContext, role: Role, over: Partial<{ email: string; name: string; password: string; active: boolean }> = {}): Promise<User> {
  const tag = randomBytes(4).toString('hex');
  return t.ctx.models.User.create({
    email: over.email ?? `${role}-${tag}@lab.example`,
    name: over.name ?? `Test ${role} ${tag}`,
    role,
    active: over.active ?? true,
    badgeCode: null,
    pinHash: null,
    lockedUntil: null,
    passwordHash: await hashPassword(over.password ?? TEST_PASSWORD),
  });
}

/** A supertest agent signed in as one user, adding the CSRF header to every write. */
export interface SignedInAgent {
  user: User;
  csrf: string;
  /** The session's Cookie header, for requests sent outside the agent's cookie jar. */
  cookie: string;
  get: (path: string) => request.Test;
  post: (path: string, body?: unknown) => request.Test;
  patch: (path: string, body?: unknown) => request.Test;
  put: (path: string, body?: unknown) => request.Test;
  delete: (path: string) => request.Test;
}

/** Signs a user in through POST /api/auth/login and keeps the session cookies. */
export async function signIn(t: TestContext, user: User, password = TEST_PASSWORD): Promise<SignedInAgent> {
  const agent = request.agent(t.app);
  const res = await agent.post('/api/auth/login').send({ email: user.email, password }).expect(200);
  const cookies = ([] as string[]).concat(res.headers['set-cookie'] ?? []);
  const csrf = cookies.map((c) => /^hm_csrf=([^;]+)/.exec(c)?.[1]).find(Boolean);
  if (!csrf) throw new Error('sign-in set no CSRF cookie');
  const cookie = cookies.map((c) => c.split(';')[0]).join('; ');
  return {
    user,
    csrf,
    cookie,
    get: (path) => agent.get(path),
    post: (path, body) => agent.post(path).set('X-CSRF-Token', csrf).send(body as object),
    patch: (path, body) => agent.patch(path).set('X-CSRF-Token', csrf).send(body as object),
    put: (path, body) => agent.put(path).set('X-CSRF-Token', csrf).send(body as object),
    delete: (path) => agent.delete(path).set('X-CSRF-Token', csrf),
  };
}

/** Creates a user of the role and signs them in. */
export async function signedInAs(t: TestContext, role: Role): Promise<SignedInAgent> {
  return signIn(t, await createUser(t, role));
}

/** Creates a station with a unique code. */
export async function createStation(t: TestContext, over: Partial<{ code: string; name: string; kind: Station['kind']; active: boolean }> = {}): Promise<Station> {
  const tag = randomBytes(3).toString('hex').toUpperCase();
  return t.ctx.models.Station.create({
    code: over.code ?? `ST-${tag}`,
    name: over.name ?? `Test station ${tag}`,
    kind: over.kind ?? 'frame',
    active: over.active ?? true,
  });
}

/** Creates an instrument token (on a new station unless one is given); returns the token once, as the API would. */
export async function createInstrumentToken(
  t: TestContext,
  over: Partial<{ station: Station; eventTypes: string[]; name: string }> = {},
): Promise<{ token: string; row: InstrumentToken; station: Station }> {
  const station = over.station ?? (await createStation(t));
  const token = `hmi_${randomBytes(32).toString('base64url')}`;
  const row = await t.ctx.models.InstrumentToken.create({
    stationId: station.id,
    name: over.name ?? 'Test instrument',
    tokenHash: hashToken(token),
    tokenPrefix: token.slice(0, 10),
    eventTypes: over.eventTypes ?? ['tested'],
    createdBy: null,
    revokedAt: null,
    lastUsedAt: null,
  });
  return { token, row, station };
}

/**
 * Signs a user in through the sign-in screen of a browser page (for browser tests of screens
 * behind the session guard); lands on `next` afterwards.
 */
export async function signInPage(page: import('playwright-core').Page, user: User, next = '/', password = TEST_PASSWORD): Promise<void> {
  await page.goto(next === '/' ? '/sign-in' : `/sign-in?next=${encodeURIComponent(next)}`);
  await page.getByLabel('E-mail').fill(user.email);
  await page.getByLabel('Password').fill(password);
  await page.getByRole('button', { name: 'Sign in' }).click();
  await page.waitForURL((u) => u.pathname + u.search === next, { timeout: 30_000 });
}
