import { isRouteErrorResponse, Link, useRouteError } from 'react-router-dom';
import { Wordmark } from '../../components/ui/wordmark';

/** The error boundary for every route: says what happened without losing the way back. */
export function RouteError() {
  const error = useRouteError();
  const message = isRouteErrorResponse(error)
    ? `${error.status} ${error.statusText}`
    : error instanceof Error
      ? error.message
      : 'An unexpected error occurred.';
  return (
    <div className="min-h-dvh bg-ink-900 px-6 py-10 text-ink-50">
      <Wordmark className="h-8 w-auto" />
      <h1 className="mt-10 text-title" role="alert">This screen ran into a problem</h1>
      <p className="mt-2 max-w-xl text-ink-200">{message}</p>
      <p className="mt-2 max-w-xl text-ink-300">Nothing you recorded before this is lost: the ledger only ever adds.</p>
      <div className="mt-6 flex gap-3">
        <button type="button" onClick={() => window.location.reload()} className="rounded-md bg-temper-500 px-4 py-2 font-semibold text-ink-950">
          Reload
        </button>
        <Link to="/" className="rounded-md px-4 py-2 font-semibold text-ink-100 ring-1 ring-ink-500">
          Back to the floor
        </Link>
      </div>
    </div>
  );
}
