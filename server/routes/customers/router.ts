import { Router } from 'express';
import { CustomerCreateSchema, CustomerListQuerySchema, CustomerUpdateSchema } from '../../../shared/schemas/customers';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { createCustomer, getCustomer, listCustomers, updateCustomer } from './handlers';

/** Customers: list, create, read, change. */
export function customersRouter(): Router {
  const router = Router();
  router.get('/', authorize('lab.read'), validate(CustomerListQuerySchema, 'query'), listCustomers);
  router.post('/', authorize('intake.write'), validate(CustomerCreateSchema), createCustomer);
  router.get('/:id', authorize('lab.read'), validate(IdParamsSchema, 'params'), getCustomer);
  router.patch('/:id', authorize('intake.write'), validate(IdParamsSchema, 'params'), validate(CustomerUpdateSchema), updateCustomer);
  return router;
}
