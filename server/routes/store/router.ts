import { Router } from 'express';
import { PutAwaySchema } from '../../../shared/schemas/retention';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getStoreTree, postPutAway } from './handlers';

/** The retained-sample store: what is where, and putting things away. */
export function storeRouter(): Router {
  const router = Router();
  router.get('/tree', authorize('lab.read'), getStoreTree);
  router.post('/put-away', authorize('events.record'), validate(PutAwaySchema), postPutAway);
  return router;
}
