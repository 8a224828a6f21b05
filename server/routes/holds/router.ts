import { Router } from 'express';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { HoldCreateSchema, HoldListQuerySchema, HoldReleaseSchema } from '../../../shared/schemas/holds';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getHolds, postHold, postRelease } from './handlers';

/** Legal holds: they block disposal until a signed release. */
export function holdsRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(HoldListQuerySchema, 'query'), getHolds);
  router.post('/', authorize('retention.write'), validate(HoldCreateSchema), postHold);
  router.post('/:id/release', authorize('retention.write'), validate(IdParamsSchema, 'params'), validate(HoldReleaseSchema), postRelease);
  return router;
}
