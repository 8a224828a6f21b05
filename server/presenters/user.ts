import type { Action } from '../../shared/permissions';
import type { User } from '../models/user';

/** A user as the API shows it: never the hashes. */
export function presentUser(user: User) {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    badgeCode: user.badgeCode,
    locked: user.lockedUntil !== null && user.lockedUntil > new Date(),
    invited: user.passwordHash === null,
    createdAt: user.createdAt,
  };
}

/** The answer of /api/auth/me and of a sign-in: the user and the actions the role may take. */
export function presentMe(user: User, permissions: readonly Action[]) {
  return { user: presentUser(user), permissions };
}
