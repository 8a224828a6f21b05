import { Router } from 'express';
import { ContainerCreateSchema, ContainerListQuerySchema } from '../../../shared/schemas/containers';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { createContainer, getContainer, listContainers } from './handlers';

/** Bins, bags, boxes, shelves and carts. */
export function containersRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(ContainerListQuerySchema, 'query'), listContainers);
  router.post('/', authorize('containers.write'), validate(ContainerCreateSchema), createContainer);
  router.get('/:code', authorize('lab.read'), getContainer);
  return router;
}
