import { Router } from 'express';
import { EventBatchSchema, EventInputSchema } from '../../../shared/schemas/events';
import { withStationOperator } from '../../auth/operator-token';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { postEvent, postEventBatch } from './handlers';

/**
 * The scan API: one custody event, or a batch of them. On a shared station an X-Operator-Token
 * header (from POST /api/auth/station-operator) attributes the events to the operator it names.
 */
export function eventsRouter(): Router {
  const router = Router();
  router.post('/', authorize('events.record'), withStationOperator(), validate(EventInputSchema), postEvent);
  router.post('/batch', authorize('events.record'), withStationOperator(), validate(EventBatchSchema), postEventBatch);
  return router;
}
