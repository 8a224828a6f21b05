import { createHash, randomBytes, timingSafeEqual } from 'node:crypto';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { can, INSTRUMENT_ACTIONS, type Action, type Role } from '../../shared/permissions';
import { forbidden, unauthorized, AppError } from '../errors';
import type { User } from '../models/user';
import { CSRF_COOKIE, SESSION_COOKIE, SESSION_TTL_SECONDS, setSessionCookies, signSession, verifySession } from '../auth/session';

/** Who is calling: a signed-in person, or an instrument with its station-bound token. */
export type Actor =
  | { kind: 'user'; id: number; role: Role; name: string; email: string; user: User }
  | { kind: 'instrument'; id: number; name: string; stationId: number; stationCode: string; eventTypes: string[] };

declare module 'express-serve-static-core' {
  interface Request {
    actor?: Actor;
  }
}

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/** SHA-256 of an instrument token, as stored; the token itself is shown once and never kept. */
export function hashToken(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

function sameString(a: string, b: string): boolean {
  const x = Buffer.from(a);
  const y = Buffer.from(b);
  return x.length === y.length && timingSafeEqual(x, y);
}

async function instrumentActor(req: Request, token: string): Promise<Actor> {
  const [rows] = await req.ctx.sequelize.query(
    `SELECT t.id, t.name, t.station_id, s.code AS station_code, t.event_types, t.revoked_at, s.active
       FROM instrument_tokens t JOIN stations s ON s.id = t.station_id WHERE t.token_hash = $1`,
    { bind: [hashToken(token)] },
  );
  const row = (rows as { id: number; name: string; station_id: number; station_code: string; event_types: string[]; revoked_at: Date | null; active: boolean }[])[0];
  if (!row) throw new AppError(401, 'bad_token', 'This instrument token is not known. Ask a lab manager for a new one.');
  if (row.revoked_at) throw new AppError(401, 'token_revoked', 'This instrument token was revoked. Ask a lab manager for a new one.');
  if (!row.active) throw new AppError(401, 'station_inactive', `Station ${row.station_code} is inactive; its tokens are refused.`);
  // Touch last_used_at at most once a minute so a busy cell does not write on every request.
  await req.ctx.sequelize.query(
    `UPDATE instrument_tokens SET last_used_at = now() WHERE id = $1 AND (last_used_at IS NULL OR last_used_at < now() - interval '1 minute')`,
    { bind: [row.id] },
  );
  return { kind: 'instrument', id: row.id, name: row.name, stationId: row.station_id, stationCode: row.station_code, eventTypes: row.event_types };
}

/**
 * Works out who is calling, for every /api request: a Bearer instrument token, or the session
 * cookie (renewed while the user is active). Cookie-authenticated writes must echo the CSRF
 * cookie in the X-CSRF-Token header. Anonymous requests pass on; authorize() refuses them.
 */
export async function authenticate(req: Request, res: Response, next: NextFunction): Promise<void> {
  const header = req.get('authorization');
  if (header?.startsWith('Bearer ')) {
    req.actor = await instrumentActor(req, header.slice(7).trim());
    return next();
  }
  const token = req.cookies?.[SESSION_COOKIE] as string | undefined;
  if (!token) return next();
  const secret = req.ctx.config.SESSION_SECRET;
  const claims = verifySession(secret, token);
  if (!claims) throw new AppError(401, 'session_invalid', 'Your session has ended or is not valid. Sign in again.');
  const user = await req.ctx.sessionUsers.get(claims.userId);
  if (!user || !user.active || user.sessionVersion !== claims.version) {
    throw new AppError(401, 'session_invalid', 'Your session has ended. Sign in again.');
  }
  if (!SAFE_METHODS.has(req.method)) {
    const cookie = req.cookies?.[CSRF_COOKIE] as string | undefined;
    const sent = req.get('x-csrf-token');
    if (!cookie || !sent || !sameString(cookie, sent)) {
      throw forbidden('The request is missing its cross-site protection token. Reload the page and try again.', { reason: 'csrf' });
    }
  }
  if (Date.now() / 1000 - claims.issuedAt > SESSION_TTL_SECONDS / 2) {
    const csrf = (req.cookies?.[CSRF_COOKIE] as string | undefined) ?? randomBytes(24).toString('base64url');
    setSessionCookies(res, signSession(secret, user.id, user.sessionVersion), csrf, req.secure);
  }
  req.actor = { kind: 'user', id: user.id, role: user.role, name: user.name, email: user.email, user };
  next();
}

/** A middleware that carries the permission it enforces, so tests can walk the router. */
export type PermissionGuard = RequestHandler & { permission: Action | 'public' | 'signed-in' };

/** Requires a caller allowed to take `action`: 401 for nobody, 403 for the wrong role or token. */
export function authorize(action: Action): PermissionGuard {
  const guard = ((req: Request, _res: Response, next: NextFunction) => {
    const actor = req.actor;
    if (!actor) throw unauthorized();
    if (actor.kind === 'instrument') {
      if (!INSTRUMENT_ACTIONS.includes(action)) throw forbidden('Instrument tokens may only post events and read items.');
    } else if (!can(actor.role, action)) {
      throw forbidden(`Your role (${actor.role}) may not do this (${action}).`, { action, role: actor.role });
    }
    next();
  }) as PermissionGuard;
  guard.permission = action;
  return guard;
}

/** Marks a route as open to anyone (sign-in, health, password reset). */
export function publicRoute(): PermissionGuard {
  const guard = ((_req: Request, _res: Response, next: NextFunction) => next()) as PermissionGuard;
  guard.permission = 'public';
  return guard;
}

/** Requires a signed-in person (not an instrument), whatever the role. */
export function signedIn(): PermissionGuard {
  const guard = ((req: Request, _res: Response, next: NextFunction) => {
    if (!req.actor) throw unauthorized();
    if (req.actor.kind !== 'user') throw forbidden('Only people may do this, not instrument tokens.');
    next();
  }) as PermissionGuard;
  guard.permission = 'signed-in';
  return guard;
}

/** The signed-in person behind a request that passed signedIn() or a user-only authorize(). */
export function currentUser(req: Request): Extract<Actor, { kind: 'user' }> {
  if (req.actor?.kind !== 'user') throw unauthorized();
  return req.actor;
}
