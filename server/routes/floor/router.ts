import { Router } from 'express';
import { authorize } from '../../middleware/auth';
import { getFloor } from './handlers';

/** GET /api/floor: counts by state and work in progress per station, for the Floor screen. */
export function floorRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), getFloor);
  return router;
}
