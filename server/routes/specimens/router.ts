import { Router } from 'express';
import { SpecimenCreateSchema, SpecimenListQuerySchema, SpecimenUpdateSchema } from '../../../shared/schemas/specimens';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { createSpecimen, getSpecimen, listSpecimens, SpecimenRefParamsSchema, updateSpecimen } from './handlers';

/** Specimens: list, register one, read by id or code, change the plan before cutting. */
export function specimensRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(SpecimenListQuerySchema, 'query'), listSpecimens);
  router.post('/', authorize('intake.write'), validate(SpecimenCreateSchema), createSpecimen);
  router.get('/:idOrCode', authorize('lab.read'), validate(SpecimenRefParamsSchema, 'params'), getSpecimen);
  router.patch('/:idOrCode', authorize('intake.write'), validate(SpecimenRefParamsSchema, 'params'), validate(SpecimenUpdateSchema), updateSpecimen);
  return router;
}
