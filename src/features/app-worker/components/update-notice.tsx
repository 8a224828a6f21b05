import { useState } from 'react';
import { applyAppUpdate, useAppVersion } from '../register';

/**
 * A small bar saying a newer version is ready, above the phone's bottom navigation. Reloading is
 * the user's choice, taken between scans; "Later" hides the bar until the next page load.
 */
export function UpdateNotice() {
  const version = useAppVersion();
  const [later, setLater] = useState(false);
  const [applying, setApplying] = useState(false);
  if (version !== 'waiting' || later) return null;
  const reload = () => {
    setApplying(true);
    void applyAppUpdate();
  };
  return (
    <div
      role="status"
      data-testid="app-update"
      className="fixed inset-x-3 bottom-20 z-30 flex flex-wrap items-center gap-3 rounded-card bg-ink-800 px-4 py-3 text-ink-50 shadow-lg ring-1 ring-temper-400 md:inset-x-auto md:bottom-4 md:right-4 md:max-w-md"
    >
      <p className="min-w-0 basis-full text-body sm:basis-0 sm:flex-1">
        <span className="font-semibold">A newer Halfmark is ready.</span>{' '}
        <span className="text-ink-200">Reload between scans; scans waiting on this device stay kept.</span>
      </p>
      <div className="ml-auto flex gap-2">
        <button type="button" onClick={() => setLater(true)} className="h-11 rounded-md px-3 text-body font-semibold text-ink-100 ring-1 ring-ink-500">
          Later
        </button>
        <button type="button" onClick={reload} disabled={applying} className="h-11 rounded-md bg-temper-400 px-4 text-body font-semibold text-ink-950 disabled:opacity-60">
          {applying ? 'Reloading…' : 'Reload now'}
        </button>
      </div>
    </div>
  );
}
