/** A small fetch wrapper that keeps the HTTP status, which the scanner needs (201 vs 200 vs 409). */
import { OPERATOR_TOKEN_HEADER } from '../../../../shared/schemas/scan';
import type { EventError } from './types';

/** An answer with its status; `error` is set for any 4xx/5xx. */
export type Answer<T> = { ok: true; status: number; body: T } | { ok: false; status: number; error: EventError };

function csrfToken(): string | undefined {
  return document.cookie
    .split('; ')
    .find((c) => c.startsWith('hm_csrf='))
    ?.slice('hm_csrf='.length);
}

/**
 * Sends a request to the API and never throws for an HTTP answer; status 0 means the network
 * failed (offline, server gone).
 *
 * @param path - Under /api, e.g. "/events".
 * @param init - Method, JSON body and the operator token of a shared station.
 */
export async function call<T>(path: string, init: { method?: string; json?: unknown; operatorToken?: string | null } = {}): Promise<Answer<T>> {
  const headers = new Headers();
  if (init.json !== undefined) headers.set('Content-Type', 'application/json');
  const csrf = csrfToken();
  if (csrf) headers.set('X-CSRF-Token', csrf);
  if (init.operatorToken) headers.set(OPERATOR_TOKEN_HEADER, init.operatorToken);
  let res: Response;
  try {
    res = await fetch(`/api${path}`, {
      method: init.method ?? (init.json === undefined ? 'GET' : 'POST'),
      credentials: 'same-origin',
      headers,
      body: init.json === undefined ? undefined : JSON.stringify(init.json),
    });
  } catch {
    return { ok: false, status: 0, error: { code: 'network', message: 'The server cannot be reached.' } };
  }
  const body: unknown = (res.headers.get('content-type') ?? '').includes('application/json') ? await res.json().catch(() => null) : null;
  if (res.ok) return { ok: true, status: res.status, body: body as T };
  const error = (body as { error?: EventError } | null)?.error;
  return { ok: false, status: res.status, error: error ?? { code: `http_${res.status}`, message: `The server answered ${res.status}.` } };
}
