/**
 * Operator tokens for a shared station: a tablet signed in by one person records events for
 * whoever last scanned their badge and typed their PIN there. The token names that operator and
 * is bound to the session it was issued to, so it is worthless on another session or device.
 */
import { createHash, createHmac, type KeyObject } from 'node:crypto';
import type { NextFunction, Request, RequestHandler, Response } from 'express';
import jwt from 'jsonwebtoken';
import { can } from '../../shared/permissions';
import { OPERATOR_TOKEN_HEADER } from '../../shared/schemas/scan';
import { AppError } from '../errors';
import { hmacKey } from './session';
import type { Actor } from '../middleware/auth';
import type { User } from '../models/user';

/** How long an operator token lasts: about one shift. The scanner also forgets the operator after a quiet spell. */
export const OPERATOR_TOKEN_TTL_SECONDS = 12 * 60 * 60;

const AUDIENCE = 'halfmark-station-operator';

interface OperatorClaims {
  sub: string;
  /** The operator's session version: a password change or deactivation ends the token too. */
  ver: number;
  /** A stamp of the operator's PIN hash: a changed or cleared PIN ends the token. */
  pin: string;
  /** The user whose session (the station's) the token was issued to. */
  tab: number;
  aud: string;
  iat: number;
  exp: number;
}

/**
 * The key operator tokens are signed with, derived from the session secret so that an operator
 * token can never pass as a session cookie (or the other way round).
 */
function operatorKey(sessionSecret: string): KeyObject {
  return hmacKey(createHmac('sha256', sessionSecret).update('halfmark station operator token v1').digest('base64url'));
}

/** A short stamp of a PIN hash; it changes whenever the PIN is set again or cleared. */
export function pinStamp(pinHash: string | null): string {
  return createHash('sha256').update(pinHash ?? '', 'utf8').digest('hex').slice(0, 16);
}

/**
 * Signs an operator token.
 *
 * @param sessionSecret - The app's SESSION_SECRET.
 * @param operator - The person who scanned their badge and typed their PIN.
 * @param stationUserId - The signed-in user of the station's session the token is bound to.
 * @returns The token and the instant it expires.
 */
export function signOperatorToken(
  sessionSecret: string,
  operator: Pick<User, 'id' | 'sessionVersion' | 'pinHash'>,
  stationUserId: number,
): { token: string; expiresAt: Date } {
  const token = jwt.sign({ ver: operator.sessionVersion, pin: pinStamp(operator.pinHash), tab: stationUserId }, operatorKey(sessionSecret), {
    algorithm: 'HS256',
    subject: String(operator.id),
    audience: AUDIENCE,
    expiresIn: OPERATOR_TOKEN_TTL_SECONDS,
  });
  const claims = jwt.decode(token) as OperatorClaims;
  return { token, expiresAt: new Date(claims.exp * 1000) };
}

/**
 * Reads an operator token.
 *
 * @param sessionSecret - The app's SESSION_SECRET.
 * @param token - What the client sent in X-Operator-Token.
 * @returns The operator's id, versions and the station user it is bound to; null when tampered, expired or malformed.
 */
export function verifyOperatorToken(
  sessionSecret: string,
  token: string,
): { operatorId: number; version: number; pin: string; stationUserId: number } | null {
  try {
    const claims = jwt.verify(token, operatorKey(sessionSecret), { algorithms: ['HS256'], audience: AUDIENCE }) as OperatorClaims;
    const operatorId = Number(claims.sub);
    if (!Number.isInteger(operatorId) || !Number.isInteger(claims.tab) || typeof claims.pin !== 'string') return null;
    return { operatorId, version: claims.ver ?? 0, pin: claims.pin, stationUserId: claims.tab };
  } catch {
    return null;
  }
}

const refused = (message: string) => new AppError(401, 'operator_token_invalid', message);

/**
 * The person a request's X-Operator-Token names, checked against the session it arrives on.
 *
 * @param req - A request whose `req.actor` is already the signed-in station user.
 * @returns The operator as an Actor (attribute events to it), or null when no header was sent.
 * @throws AppError 401 `operator_token_invalid` for a bad, expired or foreign token, or an operator
 *   who was deactivated, changed their password or PIN since; 403 when the operator may not record events.
 */
export async function operatorActor(req: Request): Promise<Extract<Actor, { kind: 'user' }> | null> {
  const token = req.get(OPERATOR_TOKEN_HEADER)?.trim();
  if (!token) return null;
  const station = req.actor;
  if (station?.kind !== 'user') {
    throw refused('An operator token is only accepted on a signed-in station session.');
  }
  const claims = verifyOperatorToken(req.ctx.config.SESSION_SECRET, token);
  if (!claims) throw refused('The operator pass has expired or is not valid. Scan your badge and type your PIN again.');
  if (claims.stationUserId !== station.id) {
    throw refused('This operator pass belongs to another station session. Scan your badge and type your PIN again.');
  }
  const user = await req.ctx.models.User.findByPk(claims.operatorId);
  if (!user || !user.active || user.sessionVersion !== claims.version || pinStamp(user.pinHash) !== claims.pin) {
    throw refused('The operator pass is no longer valid. Scan your badge and type your PIN again.');
  }
  if (!can(user.role, 'events.record')) {
    throw new AppError(403, 'forbidden', `${user.name}'s role (${user.role}) may not record events.`, { action: 'events.record', role: user.role });
  }
  return { kind: 'user', id: user.id, role: user.role, name: user.name, email: user.email, user };
}

/**
 * Middleware for the event routes, placed after their authorize('events.record') guard: when the
 * request carries X-Operator-Token, `req.actor` becomes the operator it names, so recordEvent
 * attributes the event to that person (and checks that person's role). Without the header the
 * signed-in user stays the actor.
 */
export function withStationOperator(): RequestHandler {
  return (req: Request, _res: Response, next: NextFunction) => {
    operatorActor(req).then((operator) => {
      if (operator) req.actor = operator;
      next();
    }, next);
  };
}
