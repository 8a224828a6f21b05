import { Router } from 'express';
import { HeatCreateSchema, HeatListQuerySchema, HeatUpdateSchema } from '../../../shared/schemas/heats';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { createHeat, getHeat, listHeats, updateHeat } from './handlers';

/** Heats: list, register, read, change. */
export function heatsRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(HeatListQuerySchema, 'query'), listHeats);
  router.post('/', authorize('intake.write'), validate(HeatCreateSchema), createHeat);
  router.get('/:id', authorize('lab.read'), validate(IdParamsSchema, 'params'), getHeat);
  router.patch('/:id', authorize('intake.write'), validate(IdParamsSchema, 'params'), validate(HeatUpdateSchema), updateHeat);
  return router;
}
