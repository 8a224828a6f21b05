import { Router } from 'express';
import { publicRoute } from '../../middleware/auth';
import { getHealth } from './handlers';

/** GET /api/health: public, answers whether the database is reachable and its last migration. */
export function healthRouter(): Router {
  const router = Router();
  router.get('/', publicRoute(), getHealth);
  return router;
}
