import { Router } from 'express';
import { TraceQuerySchema } from '../../../shared/schemas/trace';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getAuditJsonl, getAuditPdf, getTrace } from './handlers';

/** An item's trace and its audit pack; mounted under /items beside the item routes. */
export function traceRouter(): Router {
  const router = Router();
  router.get('/:code/trace', authorize('lab.read'), validate(TraceQuerySchema, 'query'), getTrace);
  router.get('/:code/audit.jsonl', authorize('ledger.verify'), getAuditJsonl);
  router.get('/:code/audit.pdf', authorize('ledger.verify'), getAuditPdf);
  return router;
}
