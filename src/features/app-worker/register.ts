/// <reference types="vite-plugin-pwa/vanillajs" />
/**
 * The app-shell worker (built by vite-plugin-pwa from vite.config.ts): it keeps the built app on
 * the device so the scanner opens with no network. It never answers /api. A newly deployed
 * version installs in the background and waits; the page says so and reloads only when the user
 * asks, so nobody is pulled out of a scan or a half-typed measurement.
 */
import { useSyncExternalStore } from 'react';
import { registerSW } from 'virtual:pwa-register';

/** "current": this page runs the newest version known; "waiting": a newer one is ready to load. */
export type AppVersionState = 'current' | 'waiting';

/** How often an open page asks the server for a new version, besides each page load. */
const UPDATE_CHECK_MS = 60 * 60 * 1000;

let state: AppVersionState = 'current';
const listeners = new Set<() => void>();
let sendSkipWaiting: (() => Promise<void>) | null = null;
/** The user of this tab asked for the new version. */
let askedHere = false;
/** The new version already controls this tab (another tab applied it); a plain reload loads it. */
let takenOver = false;

function setState(next: AppVersionState): void {
  state = next;
  for (const listener of listeners) listener();
}

/**
 * Registers the worker (only in a build: in `vite` dev the plugin's module does nothing) and
 * checks for a new version every hour while the page is open and online.
 */
export function startAppWorker(): void {
  if (!('serviceWorker' in navigator)) return;
  sendSkipWaiting = registerSW({
    onNeedRefresh: () => setState('waiting'),
    onNeedReload: () => {
      if (askedHere) {
        window.location.reload();
      } else {
        // Another tab took the new version; this one keeps running until its user reloads.
        takenOver = true;
        setState('waiting');
      }
    },
    onRegisteredSW: (_url, registration) => {
      if (!registration) return;
      window.setInterval(() => {
        if (navigator.onLine && !registration.installing) registration.update().catch(() => undefined);
      }, UPDATE_CHECK_MS);
    },
  });
}

/** Loads the waiting version: the new worker takes over and the page reloads once it has. */
export async function applyAppUpdate(): Promise<void> {
  askedHere = true;
  if (takenOver || !sendSkipWaiting) {
    window.location.reload();
    return;
  }
  await sendSkipWaiting();
}

/** Whether a newer version of the app is waiting, for the update notice. */
export function useAppVersion(): AppVersionState {
  return useSyncExternalStore(
    (listener) => {
      listeners.add(listener);
      return () => listeners.delete(listener);
    },
    () => state,
  );
}
