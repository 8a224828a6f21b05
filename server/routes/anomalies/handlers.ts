import type { Request, Response } from 'express';
import { AnomalyListQuerySchema } from '../../../shared/schemas/trace';
import { labAnomalies } from '../../commands/trace-anomalies';
import { parsed } from '../../middleware/validate';

/** GET /api/anomalies: anomalies across the lab, most serious first, paged. */
export async function getAnomalies(req: Request, res: Response): Promise<void> {
  res.json(await labAnomalies(req.ctx.sequelize, parsed(req, AnomalyListQuerySchema, 'query')));
}
