import { useEffect, useState } from 'react';
import { Link, NavLink, Outlet, useLocation, useNavigate, useNavigation } from 'react-router-dom';
import { ROLE_LABELS } from '../../../shared/permissions';
import { paths } from '../../config/paths';
import { useMe } from '../../features/auth/api/queries';
import { useSignOut } from '../../features/auth/api/sign-out';
import { signInHref } from '../../features/auth/session-guard';
import { ApiError } from '../../lib/api-client';
import { Wordmark } from '../ui/wordmark';
import { navItems, navSections, type NavItem } from './nav-items';

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

/** Small line icons for the phone's bottom bar, drawn here so no font needs the glyphs. */
function BarIcon({ to }: { to: string }) {
  const common = { width: 22, height: 22, viewBox: '0 0 24 24', fill: 'none', stroke: 'currentColor', strokeWidth: 2, 'aria-hidden': true } as const;
  if (to === '/') return <svg {...common}><path d="M12 3 21 12 12 21 3 12Z" /><path d="M12 3v18" /></svg>;
  if (to === '/scan') return <svg {...common}><path d="M4 8V4h4M16 4h4v4M20 16v4h-4M8 20H4v-4" /><path d="M8 12h8" /></svg>;
  if (to === '/trace') return <svg {...common}><circle cx="6" cy="6" r="2.5" /><circle cx="18" cy="18" r="2.5" /><path d="M8.5 6H14a4 4 0 0 1 0 8h-4a4 4 0 0 0 0 8h5.5" /></svg>;
  return <svg {...common}><path d="M4 7h16M4 12h16M4 17h16" /></svg>;
}

const sideLink = ({ isActive }: { isActive: boolean }) =>
  `block rounded-md px-3 py-1.5 text-body font-semibold ${isActive ? 'bg-ink-700 text-white' : 'text-ink-200 hover:bg-ink-800 hover:text-white'}`;

/** Every screen the user may open, grouped by section: the side rail, and the phone's "More" sheet. */
function SectionedNav({ items, onPick }: { items: readonly NavItem[]; onPick?: () => void }) {
  return (
    <>
      {navSections(items).map((group) => (
        <div key={group.section} className="mb-3">
          <p className="px-3 pb-1 text-caption font-semibold uppercase tracking-wide text-ink-400">{group.section}</p>
          {group.items.map((item) => (
            <NavLink key={item.to} to={item.to} end={item.to === '/'} className={sideLink} onClick={onPick}>
              {item.label}
            </NavLink>
          ))}
        </div>
      ))}
    </>
  );
}

/**
 * The frame around every screen: a top bar with the wordmark on phones, a side rail with the
 * screens in sections on desktops, and on phones a bottom bar within thumb reach holding the
 * everyday screens and a "More" sheet with the rest. Navigation shows only what the signed-in
 * user's role may use, as the server lists it in /me.
 */
export function AppShell() {
  const navigation = useNavigation();
  const location = useLocation();
  const navigate = useNavigate();
  const me = useMe();
  const items = navItems(me.data?.permissions);
  const bar = items.filter((i) => i.bar);
  const [moreOpen, setMoreOpen] = useState(false);

  // A session that ends while the app is open (expiry, password change elsewhere) goes back to sign-in.
  const ended = me.error instanceof ApiError && me.error.status === 401;
  useEffect(() => {
    if (ended) navigate(signInHref(location.pathname + location.search), { replace: true });
  }, [ended, navigate, location.pathname, location.search]);
  useEffect(() => setMoreOpen(false), [location.pathname]);

  const barLink = ({ isActive }: { isActive: boolean }) =>
    `flex h-16 flex-col items-center justify-center gap-1 text-caption font-semibold ${isActive && !moreOpen ? 'text-temper-300' : 'text-ink-200'}`;

  return (
    <div className="min-h-dvh md:grid md:grid-cols-[13rem_1fr]">
      <header className="sticky top-0 z-20 flex h-14 items-center justify-between bg-ink-900 px-4 md:hidden">
        <Wordmark className="h-7 w-auto" />
        <SessionMenu compact />
      </header>
      <aside className="hidden bg-ink-900 md:sticky md:top-0 md:flex md:h-dvh md:flex-col md:gap-5 md:overflow-y-auto md:px-4 md:py-5">
        <Wordmark className="h-8 w-auto shrink-0 self-start" />
        <nav aria-label="Main">
          <SectionedNav items={items} />
        </nav>
        <SessionMenu />
      </aside>
      <main className="mx-auto w-full max-w-6xl px-4 pb-28 pt-5 md:px-8 md:pb-10" aria-busy={navigation.state === 'loading'}>
        <Outlet />
      </main>
      {moreOpen ? (
        <div id="more-sheet" className="fixed inset-x-0 bottom-16 top-14 z-20 overflow-y-auto bg-ink-900 px-4 py-4 md:hidden">
          <nav aria-label="All screens">
            <SectionedNav items={items} onPick={() => setMoreOpen(false)} />
          </nav>
        </div>
      ) : null}
      <nav
        aria-label="Main"
        className="fixed inset-x-0 bottom-0 z-20 grid border-t border-ink-700 bg-ink-900 pb-[env(safe-area-inset-bottom)] md:hidden"
        style={{ gridTemplateColumns: `repeat(${bar.length + 1}, minmax(0, 1fr))` }}
      >
        {bar.map((item) => (
          <NavLink key={item.to} to={item.to} end={item.to === '/'} className={barLink}>
            <BarIcon to={item.to} />
            {item.label}
          </NavLink>
        ))}
        <button
          type="button"
          aria-expanded={moreOpen}
          aria-controls="more-sheet"
          onClick={() => setMoreOpen((open) => !open)}
          className={`flex h-16 flex-col items-center justify-center gap-1 text-caption font-semibold ${moreOpen ? 'text-temper-300' : 'text-ink-200'}`}
        >
          <BarIcon to="more" />
          {moreOpen ? 'Close' : 'More'}
        </button>
      </nav>
    </div>
  );
}
