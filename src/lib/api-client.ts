import type { ErrorBody, FieldIssue } from '../../shared/schemas/errors';

export type { FieldIssue } from '../../shared/schemas/errors';

/** The server's error shape `{ error: { code, message, details } }`, as a typed error. */
export class ApiError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }

  /** Field errors keyed by path, for forms to show beside their fields. */
  fieldIssues(): FieldIssue[] {
    return Array.isArray(this.details) ? (this.details as FieldIssue[]).filter((d) => typeof d?.path === 'string') : [];
  }
}

function csrfToken(): string | undefined {
  return document.cookie
    .split('; ')
    .find((c) => c.startsWith('hm_csrf='))
    ?.slice('hm_csrf='.length);
}

/** Calls the API with the session cookie (and CSRF header); throws ApiError on any error answer. */
export async function api<T>(path: string, init: RequestInit & { json?: unknown } = {}): Promise<T> {
  const headers = new Headers(init.headers);
  if (init.json !== undefined) headers.set('Content-Type', 'application/json');
  const token = csrfToken();
  if (token) headers.set('X-CSRF-Token', token);
  let res: Response;
  try {
    res = await fetch(`/api${path}`, {
      credentials: 'same-origin',
      ...init,
      headers,
      body: init.json !== undefined ? JSON.stringify(init.json) : init.body,
    });
  } catch {
    throw new ApiError(0, 'network', 'The server cannot be reached. Check the connection and try again.');
  }
  const type = res.headers.get('content-type') ?? '';
  const body = type.includes('application/json') ? await res.json() : null;
  if (!res.ok) {
    const e = (body as Partial<ErrorBody> | null)?.error;
    throw new ApiError(res.status, e?.code ?? 'http_' + res.status, e?.message ?? `The server answered ${res.status}.`, e?.details);
  }
  return body as T;
}
