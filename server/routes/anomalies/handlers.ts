import type { Request, Response } from 'express';
import { can } from '../../../shared/permissions';
import { AnomalyListQuerySchema } from '../../../shared/schemas/trace';
import { storedLabAnomalies } from '../../commands/anomaly-findings';
import { forbidden } from '../../errors';
import { parsed } from '../../middleware/validate';

/**
 * GET /api/anomalies: anomalies across the lab, most serious first, paged, from the stored
 * findings brought up to date first. `refresh=full` re-judges every chain, which is the ledger
 * check's work, so it takes the ledger.verify permission (people only, not instruments).
 */
export async function getAnomalies(req: Request, res: Response): Promise<void> {
  const query = parsed(req, AnomalyListQuerySchema, 'query');
  const full = query.refresh === 'full';
  if (full && !(req.actor?.kind === 'user' && can(req.actor.role, 'ledger.verify'))) {
    throw forbidden('Re-judging every chain (refresh=full) needs the ledger.verify permission.', { action: 'ledger.verify' });
  }
  res.json(await storedLabAnomalies(req.ctx.sequelize, query, { full }));
}
