import { AppError } from '../errors';
import type { User } from '../models/user';
import { hashPassword, verifyPassword } from './passwords';

/** After this many wrong passwords in a row the account locks for LOCK_MINUTES. */
export const MAX_FAILED_LOGINS = 5;
export const LOCK_MINUTES = 15;

/** An argon2id hash of a throwaway secret, verified against when an e-mail is unknown. */
let dummyHash: Promise<string> | null = null;

/** Throws 429 `locked` while the account is locked, naming the minutes left. */
export function assertNotLocked(user: User): void {
  if (user.lockedUntil && user.lockedUntil > new Date()) {
    const minutes = Math.ceil((user.lockedUntil.getTime() - Date.now()) / 60_000);
    throw new AppError(429, 'locked', `This account is locked after ${MAX_FAILED_LOGINS} wrong passwords. Try again in ${minutes} min, or ask a lab manager to unlock it.`);
  }
}

/**
 * Checks a password for a possibly unknown user. For an unknown or passwordless user it still
 * runs one argon2 verification, so the answer takes about as long as for a known address.
 */
export async function checkPassword(user: User | null, password: string): Promise<boolean> {
  if (user?.passwordHash) return verifyPassword(user.passwordHash, password);
  dummyHash ??= hashPassword('halfmark-timing-equaliser');
  await verifyPassword(await dummyHash, password);
  return false;
}

/** Counts a wrong password; the one that reaches the limit locks the account and answers 429. */
export async function recordFailedPassword(user: User): Promise<void> {
  const failed = user.failedLogins + 1;
  const lock = failed >= MAX_FAILED_LOGINS ? new Date(Date.now() + LOCK_MINUTES * 60_000) : null;
  await user.update({ failedLogins: lock ? 0 : failed, lockedUntil: lock });
  if (lock) {
    throw new AppError(429, 'locked', `Too many wrong passwords: this account is locked for ${LOCK_MINUTES} min. A lab manager can unlock it sooner.`);
  }
}

/** Forgets earlier failures after a right password. */
export async function clearFailures(user: User): Promise<void> {
  if (user.failedLogins > 0 || user.lockedUntil) await user.update({ failedLogins: 0, lockedUntil: null });
}
