import { createSecretKey, type KeyObject } from 'node:crypto';
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

const keys = new Map<string, KeyObject>();

/**
 * The HS256 key for a secret, made once. Handed a string, jsonwebtoken first tries to read it as
 * a public key and catches the failure on every call, which cost a tenth of a busy server's CPU.
 */
export function hmacKey(secret: string): KeyObject {
  let key = keys.get(secret);
  if (!key) {
    key = createSecretKey(Buffer.from(secret, 'utf8'));
    keys.set(secret, key);
  }
  return key;
}

/** Signs a short-lived session token for a user. */
export function signSession(secret: string, userId: number, version: number): string {
  return jwt.sign({ ver: version }, hmacKey(secret), { algorithm: 'HS256', subject: String(userId), expiresIn: SESSION_TTL_SECONDS });
}

/** Verifies a session token; null when tampered, expired or malformed. */
export function verifySession(secret: string, token: string): { userId: number; version: number; issuedAt: number } | null {
  try {
    const claims = jwt.verify(token, hmacKey(secret), { algorithms: ['HS256'] }) as SessionClaims;
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
