import type { Express } from 'express';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ACTIONS, INSTRUMENT_ACTIONS, ROLES, can, type Action, type Role } from '../../shared/permissions';
import { createInstrumentToken, createUser, signIn, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';

type Permission = Action | 'public' | 'signed-in';
interface Handle {
  (...args: never[]): unknown;
  permission?: Permission;
  stack?: Layer[];
}
interface Layer {
  rawPath?: string | string[];
  handle: Handle;
  route?: { path: string; stack: { method: string; handle: Handle }[] };
}
interface WalkedRoute {
  method: string;
  path: string;
  permission: Permission | undefined;
}

/** Every route under the app's routers, with the permission its first handler carries. */
function walk(app: Express): WalkedRoute[] {
  const out: WalkedRoute[] = [];
  const visit = (stack: Layer[], prefix: string) => {
    for (const layer of stack) {
      if (layer.route) {
        const path = prefix + (layer.route.path === '/' ? '' : layer.route.path);
        // A route's stack holds every handler of every method; the first one of each method is its guard.
        for (const method of new Set(layer.route.stack.map((x) => x.method))) {
          const first = layer.route.stack.find((x) => x.method === method)!;
          out.push({ method, path, permission: first.handle.permission });
        }
      } else if (Array.isArray(layer.handle.stack)) {
        const raw = Array.isArray(layer.rawPath) ? layer.rawPath[0] : layer.rawPath;
        visit(layer.handle.stack, raw && raw !== '/' ? prefix + raw : prefix);
      }
    }
  };
  visit((app as unknown as { router: { stack: Layer[] } }).router.stack, '');
  return out.filter((r) => r.path.startsWith('/api/'));
}

/** A concrete address for a route pattern: every parameter becomes 1. */
const concrete = (path: string) => path.replace(/:[A-Za-z]+/g, '1');

let t: TestContext;
let routes: WalkedRoute[];
const agents = new Map<Role, SignedInAgent>();

beforeAll(async () => {
  t = await createTestContext();
  routes = walk(t.app);
  for (const role of ROLES) agents.set(role, await signIn(t, await createUser(t, role)));
});
afterAll(() => t.close());

function call(app: Express, method: string, path: string) {
  const r = request(app);
  switch (method) {
    case 'get': return r.get(path);
    case 'post': return r.post(path).send({});
    case 'put': return r.put(path).send({});
    case 'patch': return r.patch(path).send({});
    case 'delete': return r.delete(path);
    default: throw new Error(`unexpected method ${method}`);
  }
}

/** Sends one request with a session's cookies but no cookie jar, so sign-out routes cannot end the session. */
function asAgent(agent: SignedInAgent, method: string, path: string) {
  return call(t.app, method, path).set('Cookie', agent.cookie).set('X-CSRF-Token', agent.csrf);
}

/** True when the guard for `action` refused: 403 naming that action (other 403s come from the handler). */
function guardRefused(res: request.Response, action: Permission): boolean {
  if (res.status !== 403) return false;
  const details = res.body?.error?.details as { action?: string } | undefined;
  return action === 'signed-in' || details?.action === action || /Instrument tokens may only/.test(res.body?.error?.message ?? '');
}

describe('the API router', () => {
  it('finds the routes of every mounted router', () => {
    expect(routes.length).toBeGreaterThan(15);
    expect(routes).toContainEqual({ method: 'post', path: '/api/auth/login', permission: 'public' });
    expect(routes).toContainEqual({ method: 'get', path: '/api/users/:id', permission: 'users.read' });
  });

  it('has a permission guard first on every route', () => {
    const unguarded = routes.filter((r) => r.permission === undefined).map((r) => `${r.method.toUpperCase()} ${r.path}`);
    expect(unguarded).toEqual([]);
  });

  it('guards only with actions declared in shared/permissions.ts', () => {
    const known = new Set<string>([...ACTIONS, 'public', 'signed-in']);
    expect(routes.filter((r) => !known.has(String(r.permission)))).toEqual([]);
  });
});

describe('every route × every role, nobody and an instrument', () => {
  it('answers 401 to nobody on every route that is not public', async () => {
    const wrong: string[] = [];
    for (const r of routes) {
      const res = await call(t.app, r.method, concrete(r.path));
      const ok = r.permission === 'public' ? res.status !== 401 && res.status !== 403 : res.status === 401;
      if (!ok) wrong.push(`${r.method.toUpperCase()} ${r.path} (${r.permission}) → ${res.status}`);
    }
    expect(wrong).toEqual([]);
  });

  for (const role of ROLES) {
    it(`as ${role}: 403 where shared/permissions.ts refuses the action, past the guard where it allows it`, async () => {
      const agent = agents.get(role)!;
      const wrong: string[] = [];
      for (const r of routes) {
        const permission = r.permission!;
        const allowed = permission === 'public' || permission === 'signed-in' || can(role, permission);
        const res = await asAgent(agent, r.method, concrete(r.path));
        const refused = res.status === 401 || guardRefused(res, permission);
        if (allowed === refused) wrong.push(`${r.method.toUpperCase()} ${r.path} (${permission}) → ${res.status} ${JSON.stringify(res.body?.error ?? '')}`);
      }
      expect(wrong).toEqual([]);
    });
  }

  it('as an instrument token: only events and reads get past the guard', async () => {
    // Made here, not up front: the manager's pass above revokes token 1 through its own route.
    const instrument = (await createInstrumentToken(t, { eventTypes: ['cut'] })).token;
    const wrong: string[] = [];
    for (const r of routes) {
      const permission = r.permission!;
      const allowed = permission === 'public' || (permission !== 'signed-in' && INSTRUMENT_ACTIONS.includes(permission));
      const res = await call(t.app, r.method, concrete(r.path)).set('Authorization', `Bearer ${instrument}`);
      const refused = res.status === 401 || guardRefused(res, permission);
      if (allowed === refused) wrong.push(`${r.method.toUpperCase()} ${r.path} (${permission}) → ${res.status}`);
    }
    expect(wrong).toEqual([]);
  });

  it('gives the auditor every read and no write', () => {
    // The product rule: auditors read everything (but the development outbox) and change nothing.
    const reads: Action[] = ['session.self', 'lab.read', 'ledger.verify', ...ACTIONS.filter((a) => a.endsWith('.read') && a !== 'outbox.read')];
    expect(reads.filter((a) => !can('auditor', a))).toEqual([]);
    expect(ACTIONS.filter((a) => can('auditor', a) && !reads.includes(a))).toEqual([]);
  });
});
