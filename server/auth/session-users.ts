/**
 * The signed-in users behind session cookies, read from the database at most once every few
 * seconds per user instead of on every request: a scanning station sends many requests a
 * minute, and on the scan path this lookup was one database round trip in five.
 *
 * Any change made through the User model (deactivation, role, password, PIN, lockout) drops
 * the user's entry at once, so on this server it takes effect on the next request. Another
 * server process sees it within SESSION_USER_TTL_MS.
 */
import type { User } from '../models/user';

/** How long a looked-up user is trusted before it is read again. */
export const SESSION_USER_TTL_MS = 5_000;
/** Past this many entries, expired ones are swept out on the next lookup. */
const SWEEP_ABOVE = 1_000;

interface Entry {
  until: number;
  user: Promise<User | null>;
}

/** Looks up users for the session middleware, remembering each answer for a few seconds. */
export interface SessionUsers {
  /** The user with this id as stored a moment ago, or null when there is none. */
  get: (id: number) => Promise<User | null>;
  /** Forgets one user, or everyone. */
  forget: (id?: number) => void;
}

/**
 * Makes the lookup for one app context and hooks it to the context's User model so that a
 * saved or deleted user is forgotten at once. Concurrent requests for the same user share one
 * query.
 */
export function createSessionUsers(model: typeof User, now: () => number = Date.now): SessionUsers {
  const entries = new Map<number, Entry>();
  const forget = (id?: number): void => {
    if (id === undefined) entries.clear();
    else entries.delete(id);
  };
  model.addHook('afterSave', (user) => forget(Number(user.get('id'))));
  model.addHook('afterDestroy', (user) => forget(Number(user.get('id'))));
  // Updates by a where clause do not say whose rows changed: forget everyone.
  model.addHook('afterBulkUpdate', () => forget());
  model.addHook('afterBulkDestroy', () => forget());
  return {
    get: (id) => {
      const at = now();
      const hit = entries.get(id);
      if (hit && hit.until > at) return hit.user;
      if (entries.size > SWEEP_ABOVE) for (const [key, entry] of entries) if (entry.until <= at) entries.delete(key);
      const user = model.findByPk(id);
      const entry = { until: at + SESSION_USER_TTL_MS, user };
      entries.set(id, entry);
      // A failed lookup is not remembered.
      user.catch(() => {
        if (entries.get(id) === entry) entries.delete(id);
      });
      return user;
    },
    forget,
  };
}
