import { Router } from 'express';
import { BatchCheckSchema, BatchCreateSchema, BatchListQuerySchema } from '../../../shared/schemas/disposals';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getBatch, getBatchDocument, getBatches, postBatch, postCheck } from './handlers';

/** Signed disposal and return batches and their documents. */
export function disposalsRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(BatchListQuerySchema, 'query'), getBatches);
  router.post('/check', authorize('disposals.write'), validate(BatchCheckSchema), postCheck);
  router.post('/', authorize('disposals.write'), validate(BatchCreateSchema), postBatch);
  router.get('/:number', authorize('lab.read'), getBatch);
  router.get('/:number/document.pdf', authorize('lab.read'), getBatchDocument);
  return router;
}
