import type { Request, Response } from 'express';
import { EventBatchSchema, EventInputSchema } from '../../../shared/schemas/events';
import { recordEvent, recordEvents } from '../../commands/record-event';
import { voidEvent } from '../../commands/void-event';
import { unauthorized } from '../../errors';
import type { LedgerActor } from '../../ledger/types';
import { parsed } from '../../middleware/validate';

function actorOf(req: Request): LedgerActor {
  if (!req.actor) throw unauthorized();
  return req.actor;
}

/** POST /api/events: 201 with the new event, 200 with the stored one for a repeated key. */
export async function postEvent(req: Request, res: Response): Promise<void> {
  const body = parsed(req, EventInputSchema);
  const actor = actorOf(req);
  const recorded = body.type === 'voided' ? await voidEvent(req.ctx, body, actor) : await recordEvent(req.ctx, body, { actor });
  res.status(recorded.status).json(recorded);
}

/** POST /api/events/batch: each event judged alone, in order; one result per event. */
export async function postEventBatch(req: Request, res: Response): Promise<void> {
  const { events } = parsed(req, EventBatchSchema);
  const outcomes = await recordEvents(req.ctx, events, { actor: actorOf(req) });
  let recorded = 0;
  let replayed = 0;
  const results = outcomes.map((outcome, index) => {
    if ('event' in outcome) {
      if (outcome.replayed) replayed++;
      else recorded++;
      return { index, ...outcome };
    }
    return { index, status: outcome.status, error: outcome.error };
  });
  res.json({ recorded, replayed, refused: outcomes.length - recorded - replayed, results });
}
