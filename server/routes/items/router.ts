import { Router } from 'express';
import { ItemEventsQuerySchema } from '../../../shared/schemas/events';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getItem, getItemEvents } from './handlers';

/** Any scanned code resolved to its item, and the item's events. */
export function itemsRouter(): Router {
  const router = Router();
  router.get('/:code', authorize('lab.read'), getItem);
  router.get('/:code/events', authorize('lab.read'), validate(ItemEventsQuerySchema, 'query'), getItemEvents);
  return router;
}
