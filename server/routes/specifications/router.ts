import { Router } from 'express';
import { SpecificationCreateSchema, SpecificationKeyParamsSchema } from '../../../shared/schemas/specifications';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { addSpecification, getSpecificationByKey, listSpecifications } from './handlers';

/** Specification limits: the built-in rows with their sources, and those a lab manager adds. */
export function specificationsRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), listSpecifications);
  router.get('/:key', authorize('lab.read'), validate(SpecificationKeyParamsSchema, 'params'), getSpecificationByKey);
  router.post('/', authorize('specifications.write'), validate(SpecificationCreateSchema), addSpecification);
  return router;
}
