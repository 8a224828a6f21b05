import type { Request, Response } from 'express';
import { can } from '../../../shared/permissions';
import { StationOperatorSchema, type StationOperatorResponse } from '../../../shared/schemas/scan';
import { hashPassword, verifyPassword } from '../../auth/passwords';
import { MAX_FAILED_LOGINS, LOCK_MINUTES } from '../../auth/lockout';
import { signOperatorToken } from '../../auth/operator-token';
import { AppError, forbidden } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import type { User } from '../../models/user';

/** An argon2id hash of a throwaway PIN, checked when a badge is unknown so both answers take as long. */
let dummyPinHash: Promise<string> | null = null;

const MISMATCH = 'That badge and PIN do not belong together. Type the PIN again, or scan your own badge.';

function assertPinNotLocked(user: User): void {
  if (user.lockedUntil && user.lockedUntil > new Date()) {
    const minutes = Math.ceil((user.lockedUntil.getTime() - Date.now()) / 60_000);
    throw new AppError(
      429,
      'locked',
      `This badge is locked after ${MAX_FAILED_LOGINS} wrong PINs or passwords. Try again in ${minutes} min, or ask a lab manager to unlock it.`,
    );
  }
}

// Wrong PINs count with wrong passwords: either way someone is guessing at this person's account.
async function recordWrongPin(user: User): Promise<void> {
  const failed = user.failedLogins + 1;
  const lock = failed >= MAX_FAILED_LOGINS ? new Date(Date.now() + LOCK_MINUTES * 60_000) : null;
  await user.update({ failedLogins: lock ? 0 : failed, lockedUntil: lock });
  if (lock) {
    throw new AppError(429, 'locked', `Too many wrong PINs: this badge is locked for ${LOCK_MINUTES} min. A lab manager can unlock it sooner.`);
  }
}

/**
 * POST /api/auth/station-operator: a person at a shared station scans their badge and types their
 * PIN; the answer is an operator token the station sends as X-Operator-Token with each event, so
 * the event is theirs. The badge alone, or the PIN alone, gets nothing.
 */
export async function switchOperator(req: Request, res: Response): Promise<void> {
  const station = currentUser(req);
  const body = parsed(req, StationOperatorSchema);
  const user = await req.ctx.models.User.findOne({ where: { badgeCode: body.badgeCode } });
  if (user) assertPinNotLocked(user);
  let ok = false;
  if (user?.active && user.pinHash) {
    ok = await verifyPassword(user.pinHash, body.pin);
  } else {
    dummyPinHash ??= hashPassword('00000000');
    await verifyPassword(await dummyPinHash, body.pin);
  }
  if (!user || !ok) {
    if (user?.active && user.pinHash) await recordWrongPin(user);
    throw new AppError(401, 'operator_refused', MISMATCH);
  }
  if (!can(user.role, 'events.record')) {
    throw forbidden(`${user.name}'s role may not record events, so they cannot operate a station.`, { action: 'events.record', role: user.role });
  }
  if (user.failedLogins > 0 || user.lockedUntil) await user.update({ failedLogins: 0, lockedUntil: null });
  const { token, expiresAt } = signOperatorToken(req.ctx.config.SESSION_SECRET, user, station.id);
  const answer: StationOperatorResponse = {
    token,
    expiresAt: expiresAt.toISOString(),
    operator: { id: user.id, name: user.name, role: user.role },
  };
  res.json(answer);
}
