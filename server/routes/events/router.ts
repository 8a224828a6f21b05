import { Router } from 'express';
import { EventBatchSchema, EventInputSchema } from '../../../shared/schemas/events';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { postEvent, postEventBatch } from './handlers';

/** The scan API: one custody event, or a batch of them. */
export function eventsRouter(): Router {
  const router = Router();
  router.post('/', authorize('events.record'), validate(EventInputSchema), postEvent);
  router.post('/batch', authorize('events.record'), validate(EventBatchSchema), postEventBatch);
  return router;
}
