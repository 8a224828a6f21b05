import jwt from 'jsonwebtoken';
import type { Response } from 'express';

export const SESSION_COOKIE = 'hm_session';
export const CSRF_COOKIE = 'hm_csrf';
/** A session lasts this long without activity; any request past half of it renews it. */
export const SESSION_TTL_SECONDS = 30 * 60;

interface SessionClaims {
  sub: string;
  /** The user's password-change stamp, so a password change ends other sessions. */
  ver: number;
  iat: number;
  exp: number;
}

/** Signs a short-lived session token for a user. */
export function signSession(secret: string, userId: number, version: number): string {
  return jwt.sign({ ver: version }, secret, { algorithm: 'HS256', subject: String(userId), expiresIn: SESSION_TTL_SECONDS });
}

/** Verifies a session token; null when tampered, expired or malformed. */
export function verifySession(secret: string, token: string): { userId: number; version: number; issuedAt: number } | null {
  try {
    const claims = jwt.verify(token, secret, { algorithms: ['HS256'] }) as SessionClaims;
    const userId = Number(claims.sub);
    if (!Number.isInteger(userId)) return null;
    return { userId, version: claims.ver ?? 0, issuedAt: claims.iat };
  } catch {
    return null;
  }
}

/** Sets the httpOnly session cookie and the readable CSRF cookie that the client echoes in a header. */
export function setSessionCookies(res: Response, token: string, csrf: string, secure: boolean): void {
  const base = { sameSite: 'strict' as const, secure, path: '/', maxAge: SESSION_TTL_SECONDS * 1000 };
  res.cookie(SESSION_COOKIE, token, { ...base, httpOnly: true });
  res.cookie(CSRF_COOKIE, csrf, { ...base, httpOnly: false });
}

/** Removes both session cookies. */
export function clearSessionCookies(res: Response): void {
  res.clearCookie(SESSION_COOKIE, { path: '/' });
  res.clearCookie(CSRF_COOKIE, { path: '/' });
}
