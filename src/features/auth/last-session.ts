/**
 * The last signed-in person this device saw, kept in localStorage so the app can open with no
 * network (a phone between buildings). It only decides what the screens show: the server still
 * checks the session cookie on every request, the first answer from /me online replaces it, a
 * 401 forgets it, and signing out forgets it.
 */
import { hashKey, type QueryClient } from '@tanstack/react-query';
import type { MeResponse } from '../../../shared/schemas/auth';
import { ApiError } from '../../lib/api-client';
import { authQueries } from './api/queries';

const STORAGE_KEY = 'halfmark.last-session';

function looksLikeMe(value: unknown): value is MeResponse {
  if (typeof value !== 'object' || value === null) return false;
  const { user, permissions } = value as { user?: unknown; permissions?: unknown };
  if (typeof user !== 'object' || user === null) return false;
  const u = user as { id?: unknown; name?: unknown; role?: unknown };
  return typeof u.id === 'number' && typeof u.name === 'string' && typeof u.role === 'string' && Array.isArray(permissions) && permissions.every((p) => typeof p === 'string');
}

/** Keeps `me` as the last signed-in person on this device. */
export function rememberSession(me: MeResponse): void {
  try {
    localStorage.setItem(STORAGE_KEY, JSON.stringify(me));
  } catch {
    // Storage full or refused (private mode): the app still works online, only not offline.
  }
}

/** The last signed-in person on this device, or null when none is kept (or what is kept is unreadable). */
export function lastSession(): MeResponse | null {
  try {
    const raw = localStorage.getItem(STORAGE_KEY);
    const value: unknown = raw ? JSON.parse(raw) : null;
    return looksLikeMe(value) ? value : null;
  } catch {
    return null;
  }
}

/** Forgets the last signed-in person (sign-out, or the server said the session is over). */
export function forgetSession(): void {
  try {
    localStorage.removeItem(STORAGE_KEY);
  } catch {
    // Nothing kept, nothing to forget.
  }
}

/**
 * Follows the /me query in `client`: every answer (fetched, or set after signing in) is kept on
 * the device, and a 401 forgets it. Returns the unsubscribe function.
 */
export function keepSessionOnDevice(client: QueryClient): () => void {
  const meHash = hashKey(authQueries.me().queryKey);
  return client.getQueryCache().subscribe((event) => {
    if (event.type !== 'updated' || event.query.queryHash !== meHash) return;
    if (event.action.type === 'success' && looksLikeMe(event.query.state.data)) rememberSession(event.query.state.data);
    if (event.action.type === 'error' && event.action.error instanceof ApiError && event.action.error.status === 401) forgetSession();
  });
}
