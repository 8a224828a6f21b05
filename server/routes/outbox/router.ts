import { Router } from 'express';
import { authorize } from '../../middleware/auth';
import { listOutbox } from './handlers';

/** The development outbox: mail the stand-in SMTP server kept. */
export function outboxRouter(): Router {
  const router = Router();
  router.get('/', authorize('outbox.read'), listOutbox);
  return router;
}
