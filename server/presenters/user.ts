import type { Action } from '../../shared/permissions';
import type { MeResponse } from '../../shared/schemas/auth';
import type { UserView } from '../../shared/schemas/users';
import type { User } from '../models/user';

/** A user as the API shows it: never the hashes. */
export function presentUser(user: User): UserView {
  return {
    id: user.id,
    email: user.email,
    name: user.name,
    role: user.role,
    active: user.active,
    badgeCode: user.badgeCode,
    locked: user.lockedUntil !== null && user.lockedUntil > new Date(),
    invited: user.passwordHash === null,
    hasPin: user.pinHash !== null,
    createdAt: user.createdAt.toISOString(),
  };
}

/** The answer of /api/auth/me and of a sign-in: the user and the actions the role may take. */
export function presentMe(user: User, permissions: readonly Action[]): MeResponse {
  return { user: presentUser(user), permissions: [...permissions] };
}
