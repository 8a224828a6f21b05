import type { Request, Response } from 'express';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { HoldCreateSchema, HoldListQuerySchema, HoldReleaseSchema } from '../../../shared/schemas/holds';
import { listHolds, placeHold, releaseHold } from '../../commands/holds';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';

/** GET /api/holds: holds, newest first; `?active=true` for those in force. */
export async function getHolds(req: Request, res: Response): Promise<void> {
  const query = parsed(req, HoldListQuerySchema, 'query');
  const items = await listHolds(req.ctx, { active: query.active === undefined ? undefined : query.active === 'true', scope: query.scope });
  res.json({ items });
}

/** POST /api/holds: places a legal hold on an order, a heat or an item. */
export async function postHold(req: Request, res: Response): Promise<void> {
  const body = parsed(req, HoldCreateSchema);
  res.status(201).json(await placeHold(req.ctx, body, currentUser(req).id));
}

/** POST /api/holds/:id/release: ends a hold, signed with the meaning "hold-release". */
export async function postRelease(req: Request, res: Response): Promise<void> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const body = parsed(req, HoldReleaseSchema);
  res.json(await releaseHold(req.ctx, id, body, currentUser(req).id));
}
