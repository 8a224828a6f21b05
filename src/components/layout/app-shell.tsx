import { NavLink, Outlet, useNavigation } from 'react-router-dom';
import { Wordmark } from '../ui/wordmark';
import { navItems } from './nav-items';

/**
 * The frame around every screen: a top bar with the wordmark on every size, a side rail on
 * desktops, and a bottom bar within thumb reach on phones.
 */
export function AppShell() {
  const navigation = useNavigation();
  const items = navItems();
  return (
    <div className="min-h-dvh md:grid md:grid-cols-[13rem_1fr]">
      <header className="sticky top-0 z-20 flex h-14 items-center justify-between bg-ink-900 px-4 md:hidden">
        <Wordmark className="h-7 w-auto" />
      </header>
      <aside className="hidden bg-ink-900 md:flex md:flex-col md:gap-6 md:px-4 md:py-5">
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
