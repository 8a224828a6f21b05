import type { Request, Response } from 'express';
import { ItemEventsQuerySchema } from '../../../shared/schemas/events';
import { readItem, readItemEvents } from '../../ledger/items';
import { parsed } from '../../middleware/validate';

/** GET /api/items/:code: what a scanned code is, its state, where it is and what may come next. */
export async function getItem(req: Request, res: Response): Promise<void> {
  res.json(await readItem(req.ctx.sequelize, String(req.params.code)));
}

/** GET /api/items/:code/events: the item's chain, oldest first. */
export async function getItemEvents(req: Request, res: Response): Promise<void> {
  const page = parsed(req, ItemEventsQuerySchema, 'query');
  res.json(await readItemEvents(req.ctx.sequelize, String(req.params.code), page));
}
