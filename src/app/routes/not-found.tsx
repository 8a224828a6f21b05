import { Link } from 'react-router-dom';

/** Any address the app does not know. */
export function NotFoundRoute() {
  return (
    <div className="py-16 text-center">
      <p className="font-mono text-display text-temper-500">404</p>
      <h1 className="mt-2 text-title">Nothing lives at this address</h1>
      <p className="mt-2 text-ink-500">The page may have moved, or the link was mistyped.</p>
      <Link to="/" className="mt-6 inline-block rounded-md bg-ink-900 px-4 py-2 font-semibold text-white">
        Back to the floor
      </Link>
    </div>
  );
}
