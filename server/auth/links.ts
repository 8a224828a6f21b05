import { createHash, randomBytes } from 'node:crypto';
import type { Request } from 'express';
import type { Transaction } from 'sequelize';
import type { AppContext } from '../app';
import { AppError, notFound } from '../errors';
import type { OneTimePurpose, OneTimeToken } from '../models/one-time-token';
import type { User } from '../models/user';
import { hashPassword } from './passwords';

/** How long an e-mailed invitation or reset link stays valid. */
export const LINK_TTL_HOURS = 72;

/** SHA-256 of a one-time or signature token, as stored; the token itself only travels to its owner. */
export function hashSecret(token: string): string {
  return createHash('sha256').update(token, 'utf8').digest('hex');
}

/** A new random token: 32 bytes, URL-safe. */
export function newSecret(): string {
  return randomBytes(32).toString('base64url');
}

/** The address links in e-mails point at: PUBLIC_URL when set, else the address the request came to. */
export function publicBase(req: Request): string {
  return (req.ctx.config.PUBLIC_URL ?? `${req.protocol}://${req.get('host')}`).replace(/\/+$/, '');
}

/** Creates a one-time link token for a user; only its hash is stored. */
export async function issueLink(ctx: AppContext, userId: number, purpose: OneTimePurpose, transaction?: Transaction): Promise<string> {
  const token = newSecret();
  await ctx.models.OneTimeToken.create(
    { userId, purpose, tokenHash: hashSecret(token), expiresAt: new Date(Date.now() + LINK_TTL_HOURS * 3600_000), usedAt: null },
    { transaction },
  );
  return token;
}

/** Finds the link and its user, refusing unknown, spent and expired links with a clear message. */
async function openLink(ctx: AppContext, token: string, transaction?: Transaction): Promise<{ link: OneTimeToken; user: User }> {
  const link = await ctx.models.OneTimeToken.findOne({
    where: { tokenHash: hashSecret(token) },
    transaction,
    lock: transaction ? transaction.LOCK.UPDATE : undefined,
  });
  if (!link) throw notFound('This link is not valid. Check that you copied all of it, or ask for a new one.');
  if (link.usedAt) throw new AppError(410, 'link_used', 'This link was already used. Each link works once; ask for a new one if you need to.');
  if (link.expiresAt <= new Date()) {
    throw new AppError(410, 'link_expired', `This link has expired (links last ${LINK_TTL_HOURS} hours). Ask for a new one.`);
  }
  const user = await ctx.models.User.findByPk(link.userId, { transaction });
  if (!user || !user.active) throw new AppError(410, 'account_inactive', 'This account is deactivated. Ask a lab manager.');
  return { link, user };
}

/** What a link is for and whose it is, without spending it. */
export async function describeLink(ctx: AppContext, token: string): Promise<{ link: OneTimeToken; user: User }> {
  return openLink(ctx, token);
}

/**
 * Spends a link to set the user's password: every other open link of the user is spent too, the
 * lock is lifted, and the session version moves on so that every other session ends.
 */
export async function spendLink(ctx: AppContext, token: string, password: string): Promise<User> {
  const hash = await hashPassword(password);
  return ctx.sequelize.transaction(async (transaction) => {
    const { user } = await openLink(ctx, token, transaction);
    await ctx.models.OneTimeToken.update({ usedAt: new Date() }, { where: { userId: user.id, usedAt: null }, transaction });
    await user.update(
      { passwordHash: hash, failedLogins: 0, lockedUntil: null, sessionVersion: user.sessionVersion + 1 },
      { transaction },
    );
    return user;
  });
}
