import { Router } from 'express';
import { SearchQuerySchema } from '../../../shared/schemas/trace';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getSearch } from './handlers';

/** One search across codes, heat numbers, order numbers and purchase-order references. */
export function searchRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(SearchQuerySchema, 'query'), getSearch);
  return router;
}
