import { Router } from 'express';
import { StationOperatorSchema } from '../../../shared/schemas/scan';
import { signedIn } from '../../middleware/auth';
import { passwordRateLimit } from '../../middleware/rate-limit';
import { validate } from '../../middleware/validate';
import { switchOperator } from './handlers';

/**
 * Switching the operator at a shared station; mount at /api/auth/station-operator. The station
 * itself must be signed in; the badge and PIN say who works at it now.
 */
export function stationOperatorRouter(): Router {
  const router = Router();
  router.post('/', signedIn(), passwordRateLimit(), validate(StationOperatorSchema), switchOperator);
  return router;
}
