import type { Transaction } from 'sequelize';
import { SIGNATURE_TTL_SECONDS, type SignatureMeaning } from '../../shared/schemas/auth';
import type { AppContext } from '../app';
import { AppError, forbidden } from '../errors';
import { hashSecret, newSecret } from './links';

/** A spent signature, for the signed action's ledger event to record. */
export interface ConsumedSignature {
  signer: number;
  meaning: SignatureMeaning;
  signedAt: string;
}

/** Issues a signature token after the password was checked again; only its hash is kept. */
export async function issueSignature(ctx: AppContext, userId: number, meaning: SignatureMeaning): Promise<{ token: string; expiresAt: Date }> {
  const token = newSecret();
  const expiresAt = new Date(Date.now() + SIGNATURE_TTL_SECONDS * 1000);
  await ctx.models.SignatureToken.create({ userId, meaning, tokenHash: hashSecret(token), expiresAt, usedAt: null });
  return { token, expiresAt };
}

/**
 * Spends a signature token inside the signed action's transaction, so that the signature is only
 * used up if the action commits. The token must belong to `userId` (the person taking the action)
 * and, when `expectedMeanings` is given, carry one of those meanings.
 *
 * @returns The signer's user id, the meaning, and when the signature was given (ISO 8601).
 * @throws AppError 403 `signature_invalid` for an unknown token or someone else's; 422
 *   `signature_expired`, `signature_used` or `signature_meaning` for a stale, spent or mismatched one.
 */
export async function consumeSignature(
  ctx: AppContext,
  token: string,
  opts: { userId: number; expectedMeanings?: readonly SignatureMeaning[] },
  transaction: Transaction,
): Promise<ConsumedSignature> {
  const row = await ctx.models.SignatureToken.findOne({
    where: { tokenHash: hashSecret(String(token)) },
    transaction,
    lock: transaction.LOCK.UPDATE,
  });
  if (!row || row.userId !== opts.userId) {
    throw forbidden('This signature is not valid for you. Sign again with your own password.', { reason: 'signature_invalid' });
  }
  if (row.usedAt) throw new AppError(422, 'signature_used', 'This signature was already used. Each signature covers one action; sign again.');
  if (row.expiresAt <= new Date()) {
    throw new AppError(422, 'signature_expired', `This signature has expired (signatures last ${SIGNATURE_TTL_SECONDS / 60} minutes). Sign again.`);
  }
  const meaning = row.meaning as SignatureMeaning;
  if (opts.expectedMeanings && !opts.expectedMeanings.includes(meaning)) {
    throw new AppError(422, 'signature_meaning', `This signature means "${meaning}", but this action needs ${opts.expectedMeanings.map((m) => `"${m}"`).join(' or ')}. Sign again with the right meaning.`, {
      meaning,
      expected: opts.expectedMeanings,
    });
  }
  await row.update({ usedAt: new Date() }, { transaction });
  return { signer: row.userId, meaning, signedAt: row.createdAt.toISOString() };
}
