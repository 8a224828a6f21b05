import { randomBytes } from 'node:crypto';
import type { Request, Response } from 'express';
import { Op } from 'sequelize';
import {
  LinkInfoSchema,
  LoginSchema,
  ResetRequestSchema,
  SetPasswordSchema,
  SIGNATURE_MEANINGS,
  SignatureSchema,
  type LinkInfoResponse,
  type SignatureResponse,
} from '../../../shared/schemas/auth';
import { ChangePasswordSchema, SetPinSchema } from '../../../shared/schemas/users';
import { ROLE_PERMISSIONS } from '../../../shared/permissions';
import { AppError } from '../../errors';
import { logger } from '../../logger';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { clearSessionCookies, CSRF_COOKIE, setSessionCookies, signSession } from '../../auth/session';
import { hashPassword } from '../../auth/passwords';
import { assertNotLocked, checkPassword, clearFailures, recordFailedPassword } from '../../auth/lockout';
import { describeLink, issueLink, LINK_TTL_HOURS, publicBase, spendLink } from '../../auth/links';
import { issueSignature } from '../../auth/signatures';
import { passwordResetMail } from '../../mail/messages';
import { presentMe, presentUser } from '../../presenters/user';
import type { User } from '../../models/user';

export { LOCK_MINUTES, MAX_FAILED_LOGINS } from '../../auth/lockout';

const BAD_PAIR = 'The e-mail address or the password is wrong.';
const RESET_ANSWER = 'If an active account uses this address, a message with a link to choose a new password is on its way. The link lasts 72 hours.';

function findByEmail(req: Request, email: string): Promise<User | null> {
  return req.ctx.models.User.findOne({ where: { email: { [Op.iLike]: email.replace(/[\\%_]/g, '\\$&') } } });
}

function startSession(req: Request, res: Response, user: User): void {
  setSessionCookies(res, signSession(req.ctx.config.SESSION_SECRET, user.id, user.sessionVersion), randomBytes(24).toString('base64url'), req.secure);
}

/** POST /api/auth/login: checks the pair, counts failures, locks after too many, sets the session. */
export async function login(req: Request, res: Response): Promise<void> {
  const { email, password } = parsed(req, LoginSchema);
  const user = await findByEmail(req, email);
  if (user) assertNotLocked(user);
  const ok = (await checkPassword(user, password)) && user !== null && user.active;
  if (!ok || !user) {
    if (user) await recordFailedPassword(user);
    throw new AppError(401, 'bad_credentials', BAD_PAIR);
  }
  await clearFailures(user);
  startSession(req, res, user);
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

/**
 * POST /api/auth/signature: checks the password again and returns a short-lived, single-use
 * signature token with the stated meaning. Wrong passwords count towards the lockout.
 */
export async function sign(req: Request, res: Response): Promise<void> {
  const { password, meaning } = parsed(req, SignatureSchema);
  const { user } = currentUser(req);
  assertNotLocked(user);
  if (!(await checkPassword(user, password))) {
    await recordFailedPassword(user);
    throw new AppError(403, 'signature_refused', 'The password is wrong, so nothing was signed. Type your own password to sign.', [
      { path: 'password', message: 'The password is wrong.' },
    ]);
  }
  await clearFailures(user);
  const { token, expiresAt } = await issueSignature(req.ctx, user.id, meaning);
  const body: SignatureResponse = { signatureToken: token, meaning, statement: SIGNATURE_MEANINGS[meaning], expiresAt: expiresAt.toISOString() };
  res.status(201).json(body);
}

/** POST /api/auth/password: changes one's own password and ends every other session. */
export async function changePassword(req: Request, res: Response): Promise<void> {
  const { currentPassword, newPassword } = parsed(req, ChangePasswordSchema);
  const { user } = currentUser(req);
  assertNotLocked(user);
  if (!(await checkPassword(user, currentPassword))) {
    await recordFailedPassword(user);
    throw new AppError(422, 'invalid', 'Your current password is wrong; nothing changed.', [{ path: 'currentPassword', message: 'This is not your current password.' }]);
  }
  await user.update({ passwordHash: await hashPassword(newPassword), failedLogins: 0, lockedUntil: null, sessionVersion: user.sessionVersion + 1 });
  // This session carries on with the new version; the CSRF cookie stays the same.
  const csrf = (req.cookies?.[CSRF_COOKIE] as string | undefined) ?? randomBytes(24).toString('base64url');
  setSessionCookies(res, signSession(req.ctx.config.SESSION_SECRET, user.id, user.sessionVersion), csrf, req.secure);
  res.json(presentMe(user, ROLE_PERMISSIONS[user.role]));
}

/** PUT /api/auth/pin: sets one's PIN for switching operator at a shared station (password again). */
export async function setPin(req: Request, res: Response): Promise<void> {
  const { password, pin } = parsed(req, SetPinSchema);
  const { user } = currentUser(req);
  assertNotLocked(user);
  if (!(await checkPassword(user, password))) {
    await recordFailedPassword(user);
    throw new AppError(422, 'invalid', 'Your password is wrong; the PIN was not changed.', [{ path: 'password', message: 'This is not your password.' }]);
  }
  await user.update({ pinHash: await hashPassword(pin) });
  res.json(presentUser(user));
}

/** DELETE /api/auth/pin: removes one's PIN. */
export async function clearPin(req: Request, res: Response): Promise<void> {
  const { user } = currentUser(req);
  await user.update({ pinHash: null });
  res.json(presentUser(user));
}

/**
 * POST /api/auth/password-reset: e-mails a reset link to an active account. The answer is the
 * same whether or not the address is known, so it cannot be used to find accounts.
 */
export async function requestReset(req: Request, res: Response): Promise<void> {
  const { email } = parsed(req, ResetRequestSchema);
  const user = await findByEmail(req, email);
  if (user?.active) {
    const token = await issueLink(req.ctx, user.id, 'reset');
    const link = `${publicBase(req)}/set-password?token=${token}`;
    try {
      await req.ctx.mailer.send(passwordResetMail({ to: user.email, name: user.name, link, hours: LINK_TTL_HOURS }));
    } catch (err) {
      // The answer must not differ for known addresses, so a mail failure is only logged.
      logger.error({ err }, 'password reset mail failed');
    }
  }
  res.status(202).json({ message: RESET_ANSWER });
}

/** POST /api/auth/link: what an invitation or reset link is for, before it is spent. */
export async function linkInfo(req: Request, res: Response): Promise<void> {
  const { token } = parsed(req, LinkInfoSchema);
  const { link, user } = await describeLink(req.ctx, token);
  const body: LinkInfoResponse = { purpose: link.purpose, email: user.email, name: user.name, expiresAt: link.expiresAt.toISOString() };
  res.json(body);
}

/** POST /api/auth/set-password: spends a link, sets the password, and signs the user in. */
export async function setPassword(req: Request, res: Response): Promise<void> {
  const { token, password } = parsed(req, SetPasswordSchema);
  const user = await spendLink(req.ctx, token, password);
  startSession(req, res, user);
  res.json(presentMe(user, ROLE_PERMISSIONS[user.role]));
}
