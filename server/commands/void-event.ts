/**
 * Voids: a signed correction event that cancels the most recent event in force on an item and
 * restores the state before it. Nothing is edited or deleted; the void is itself in the chain.
 */
import { QueryTypes } from 'sequelize';
import { can } from '../../shared/permissions';
import { EventInputSchema, type EventInput } from '../../shared/schemas/events';
import type { AppContext } from '../app';
import { consumeSignature } from '../auth/signatures';
import { forbidden, unprocessable } from '../errors';
import { fieldIssues } from '../middleware/validate';
import type { LedgerActor, RecordedEvent } from '../ledger/types';
import { recordEvent } from './record-event';

/**
 * Records a `voided` event: needs a person whose role may void (events.void), a reason in the
 * payload, and a signature token with the meaning "void" (POST /api/auth/signature), which is
 * spent in the same transaction as the event, so a refused void leaves the signature unused.
 * `input.corrects` names the event to cancel (its hash); the most recent event in force when
 * left out. Sending the same idempotency key again answers with the stored void.
 */
export async function voidEvent(ctx: AppContext, input: EventInput, actor: LedgerActor): Promise<RecordedEvent> {
  const parsed = EventInputSchema.safeParse({ ...input, type: 'voided' });
  if (!parsed.success) throw unprocessable('Some fields of the void are not valid; see details.', fieldIssues(parsed.error));
  const body = parsed.data;
  if (actor.kind !== 'user' || !can(actor.role, 'events.void')) {
    throw forbidden('Only a lab manager may void events.', { action: 'events.void' });
  }
  const [seen] = await ctx.sequelize.query<{ id: string }>('SELECT id FROM custody_events WHERE idempotency_key = $1', {
    bind: [body.idempotencyKey],
    type: QueryTypes.SELECT,
  });
  // A retry of a void already recorded: answer with it, without spending another signature.
  if (seen) return recordEvent(ctx, body, { actor });
  if (!body.signatureToken) {
    throw unprocessable('A void needs a signature: sign with your password (meaning "void"), then send the signature token.', [
      { path: 'signatureToken', message: 'is required for a void' },
    ]);
  }
  const token = body.signatureToken;
  return ctx.sequelize.transaction(async (transaction) => {
    const signature = await consumeSignature(ctx, token, { userId: actor.id, expectedMeanings: ['void'] }, transaction);
    return recordEvent(ctx, body, { actor, transaction, signature });
  });
}
