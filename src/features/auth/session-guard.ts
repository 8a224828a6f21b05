import { redirect, type LoaderFunctionArgs } from 'react-router-dom';
import { ApiError } from '../../lib/api-client';
import { queryClient } from '../../lib/query-client';
import { paths } from '../../config/paths';
import { authQueries } from './api/queries';
import { forgetSession, lastSession } from './last-session';

/** A path inside the app to return to after signing in; anything else falls back to the floor. */
export function safeNext(next: string | null): string {
  return next && next.startsWith('/') && !next.startsWith('//') && !next.startsWith(paths.signIn.path) ? next : paths.home.path;
}

/** The sign-in address that brings the user back to `to` afterwards. */
export function signInHref(to: string): string {
  return to === paths.home.path ? paths.signIn.path : `${paths.signIn.path}?next=${encodeURIComponent(to)}`;
}

/**
 * Loader for every screen behind the shell: anonymous callers go to the sign-in screen and come
 * back to where they were going. With no network, the last person signed in on this device is
 * taken as signed in (the server still checks every request), so the scanner opens offline.
 */
export async function requireSession({ request }: LoaderFunctionArgs) {
  try {
    return await queryClient.ensureQueryData(authQueries.me());
  } catch (err) {
    if (err instanceof ApiError && err.status === 401) {
      forgetSession();
      const url = new URL(request.url);
      throw redirect(signInHref(url.pathname + url.search));
    }
    const last = err instanceof ApiError && err.status === 0 ? lastSession() : null;
    if (last) {
      // Marked as old, so /me is asked again as soon as the network is back.
      queryClient.setQueryData(authQueries.me().queryKey, last, { updatedAt: 0 });
      return last;
    }
    throw err;
  }
}

/** Loader for the sign-in screen: someone already signed in goes straight on. */
export async function redirectIfSignedIn({ request }: LoaderFunctionArgs) {
  const me = await queryClient.fetchQuery(authQueries.me()).catch(() => null);
  if (me) throw redirect(safeNext(new URL(request.url).searchParams.get('next')));
  return null;
}
