import { useEffect } from 'react';
import { Link, NavLink, Outlet, useLocation, useNavigate, useNavigation } from 'react-router-dom';
import { ROLE_LABELS } from '../../../shared/permissions';
import { paths } from '../../config/paths';
import { useMe } from '../../features/auth/api/queries';
import { useSignOut } from '../../features/auth/api/sign-out';
import { signInHref } from '../../features/auth/session-guard';
import { ApiError } from '../../lib/api-client';
import { Wordmark } from '../ui/wordmark';
import { navItems } from './nav-items';

/** The signed-in person's name and role, a link to their account, and sign-out. */
function SessionMenu({ compact }: { compact?: boolean }) {
  const me = useMe();
  const signOut = useSignOut();
  const navigate = useNavigate();
  if (!me.data) return null;
  const { user } = me.data;
  const onSignOut = () =>
    signOut.mutate(undefined, { onSettled: () => navigate(paths.signIn.path, { replace: true }) });
  return (
    <div className={compact ? 'flex items-center gap-2' : 'mt-auto flex flex-col gap-2 border-t border-ink-700 pt-4'}>
      <Link to={paths.account.path} className="min-w-0 rounded-md px-2 py-1 text-ink-100 hover:bg-ink-800" data-testid="session-user">
        <span className={`block truncate font-semibold ${compact ? 'max-w-[9rem] text-caption' : 'text-body'}`}>{user.name}</span>
        <span className="block truncate text-caption text-ink-300">{ROLE_LABELS[user.role]}</span>
      </Link>
      <button
        type="button"
        onClick={onSignOut}
        disabled={signOut.isPending}
        className="rounded-md px-3 py-2 text-left text-body font-semibold text-ink-200 ring-1 ring-ink-600 hover:bg-ink-800 hover:text-white"
      >
        Sign out
      </button>
    </div>
  );
}

/**
 * The frame around every screen: a top bar with the wordmark on every size, a side rail on
 * desktops, and a bottom bar within thumb reach on phones. Navigation shows only what the
 * signed-in user's role may use, as the server lists it in /me.
 */
export function AppShell() {
  const navigation = useNavigation();
  const location = useLocation();
  const navigate = useNavigate();
  const me = useMe();
  const items = navItems(me.data?.permissions);

  // A session that ends while the app is open (expiry, password change elsewhere) goes back to sign-in.
  const ended = me.error instanceof ApiError && me.error.status === 401;
  useEffect(() => {
    if (ended) navigate(signInHref(location.pathname + location.search), { replace: true });
  }, [ended, navigate, location.pathname, location.search]);

  return (
    <div className="min-h-dvh md:grid md:grid-cols-[13rem_1fr]">
      <header className="sticky top-0 z-20 flex h-14 items-center justify-between bg-ink-900 px-4 md:hidden">
        <Wordmark className="h-7 w-auto" />
        <SessionMenu compact />
      </header>
      <aside className="hidden bg-ink-900 md:sticky md:top-0 md:flex md:h-dvh md:flex-col md:gap-6 md:px-4 md:py-5">
        <Wordmark className="h-8 w-auto self-start" />
        <nav aria-label="Main" className="flex flex-col gap-1">
          {items.map((item) => (
            <NavLink
              key={item.to}
              to={item.to}
              end={item.to === '/'}
              className={({ isActive }) =>
                `rounded-md px-3 py-2 text-body font-semibold ${isActive ? 'bg-ink-700 text-white' : 'text-ink-200 hover:bg-ink-800 hover:text-white'}`
              }
            >
              {item.label}
            </NavLink>
          ))}
        </nav>
        <SessionMenu />
      </aside>
      <main className="mx-auto w-full max-w-6xl px-4 pb-28 pt-5 md:px-8 md:pb-10" aria-busy={navigation.state === 'loading'}>
        <Outlet />
      </main>
      <nav
        aria-label="Main"
        className="fixed inset-x-0 bottom-0 z-20 grid border-t border-ink-700 bg-ink-900 pb-[env(safe-area-inset-bottom)] md:hidden"
        style={{ gridTemplateColumns: `repeat(${Math.min(items.length, 5)}, minmax(0, 1fr))` }}
      >
        {items.slice(0, 5).map((item) => (
          <NavLink
            key={item.to}
            to={item.to}
            end={item.to === '/'}
            className={({ isActive }) =>
              `flex h-16 flex-col items-center justify-center gap-1 text-caption font-semibold ${isActive ? 'text-temper-300' : 'text-ink-200'}`
            }
          >
            <span aria-hidden className="text-lg leading-none">{item.glyph}</span>
            {item.label}
          </NavLink>
        ))}
      </nav>
    </div>
  );
}
