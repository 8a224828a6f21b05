import { Router } from 'express';
import { AnomalyListQuerySchema } from '../../../shared/schemas/trace';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getAnomalies } from './handlers';

/** The lab-wide anomaly list. */
export function anomaliesRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(AnomalyListQuerySchema, 'query'), getAnomalies);
  return router;
}
