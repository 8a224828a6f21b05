import { randomBytes } from 'node:crypto';
import type { Request, Response } from 'express';
import { Op } from 'sequelize';
import { LoginSchema } from '../../../shared/schemas/auth';
import { ROLE_PERMISSIONS } from '../../../shared/permissions';
import { AppError } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { clearSessionCookies, setSessionCookies, signSession } from '../../auth/session';
import { verifyPassword } from '../../auth/passwords';
import { presentMe } from '../../presenters/user';

/** After this many wrong passwords in a row the account locks for LOCK_MINUTES. */
export const MAX_FAILED_LOGINS = 5;
export const LOCK_MINUTES = 15;
const BAD_PAIR = 'The e-mail address or the password is wrong.';

/** POST /api/auth/login: checks the pair, counts failures, locks after too many, sets the session. */
export async function login(req: Request, res: Response): Promise<void> {
  const { email, password } = parsed(req, LoginSchema);
  const { User } = req.ctx.models;
  const user = await User.findOne({ where: { email: { [Op.iLike]: email.replace(/[\\%_]/g, '\\$&') } } });
  if (user?.lockedUntil && user.lockedUntil > new Date()) {
    const minutes = Math.ceil((user.lockedUntil.getTime() - Date.now()) / 60_000);
    throw new AppError(429, 'locked', `This account is locked after ${MAX_FAILED_LOGINS} wrong passwords. Try again in ${minutes} min, or ask a lab manager to unlock it.`);
  }
  const ok = user !== null && user.active && (await verifyPassword(user.passwordHash, password));
  if (!ok || !user) {
    if (user) {
      const failed = user.failedLogins + 1;
      const lock = failed >= MAX_FAILED_LOGINS ? new Date(Date.now() + LOCK_MINUTES * 60_000) : null;
      await user.update({ failedLogins: lock ? 0 : failed, lockedUntil: lock });
      if (lock) {
        throw new AppError(429, 'locked', `Too many wrong passwords: this account is locked for ${LOCK_MINUTES} min. A lab manager can unlock it sooner.`);
      }
    }
    throw new AppError(401, 'bad_credentials', BAD_PAIR);
  }
  if (user.failedLogins > 0 || user.lockedUntil) await user.update({ failedLogins: 0, lockedUntil: null });
  setSessionCookies(res, signSession(req.ctx.config.SESSION_SECRET, user.id, user.sessionVersion), randomBytes(24).toString('base64url'), req.secure);
  res.json(presentMe(user, ROLE_PERMISSIONS[user.role]));
}

/** POST /api/auth/logout: ends the session on this device. */
export async function logout(_req: Request, res: Response): Promise<void> {
  clearSessionCookies(res);
  res.status(204).end();
}

/** GET /api/auth/me: who I am, my role, and the actions I may take. */
export async function getMe(req: Request, res: Response): Promise<void> {
  const me = currentUser(req);
  res.json(presentMe(me.user, ROLE_PERMISSIONS[me.role]));
}
