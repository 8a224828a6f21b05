import { Router } from 'express';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { SampleCreateSchema, SampleListQuerySchema, SampleUpdateSchema } from '../../../shared/schemas/samples';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { createSample, getSample, listSamples, updateSample } from './handlers';

/** Samples: list, register, read, change. */
export function samplesRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(SampleListQuerySchema, 'query'), listSamples);
  router.post('/', authorize('intake.write'), validate(SampleCreateSchema), createSample);
  router.get('/:id', authorize('lab.read'), validate(IdParamsSchema, 'params'), getSample);
  router.patch('/:id', authorize('intake.write'), validate(IdParamsSchema, 'params'), validate(SampleUpdateSchema), updateSample);
  return router;
}
