import { Router } from 'express';
import { CutListCreateSchema } from '../../../shared/schemas/cut-list';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { OrderCreateSchema, OrderHeatAddSchema, OrderListQuerySchema, OrderUpdateSchema } from '../../../shared/schemas/orders';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import {
  addOrderHeat,
  createOrder,
  getOrder,
  importCutListCsv,
  listOrders,
  makeCutList,
  previewCutListCsv,
  updateOrder,
} from './handlers';
import { cutListUpload } from './upload';

/** Orders: list, create, read, change; their heats; their cut list, made or imported from CSV. */
export function ordersRouter(): Router {
  const router = Router();
  const id = validate(IdParamsSchema, 'params');
  router.get('/', authorize('lab.read'), validate(OrderListQuerySchema, 'query'), listOrders);
  router.post('/', authorize('intake.write'), validate(OrderCreateSchema), createOrder);
  router.get('/:id', authorize('lab.read'), id, getOrder);
  router.patch('/:id', authorize('intake.write'), id, validate(OrderUpdateSchema), updateOrder);
  router.post('/:id/heats', authorize('intake.write'), id, validate(OrderHeatAddSchema), addOrderHeat);
  router.post('/:id/cut-list', authorize('intake.write'), id, validate(CutListCreateSchema), makeCutList);
  router.post('/:id/cut-list/preview', authorize('intake.write'), id, cutListUpload(), previewCutListCsv);
  router.post('/:id/cut-list/import', authorize('intake.write'), id, cutListUpload(), importCutListCsv);
  return router;
}
