import { Router } from 'express';
import { IdParamsSchema } from '../../../shared/schemas/intake-common';
import { DigestRunSchema, DueQuerySchema, RuleUpdateSchema, SettingsUpdateSchema } from '../../../shared/schemas/retention';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getDue, getItemRetention, getOrderRule, getSettings, postDigest, putCustomerRule, putOrderRule, putSettings } from './handlers';

/** Retention: the lab's settings, rules on customers and orders, the due list and the digest. */
export function retentionRouter(): Router {
  const router = Router();
  router.get('/settings', authorize('lab.read'), getSettings);
  router.put('/settings', authorize('retention.write'), validate(SettingsUpdateSchema), putSettings);
  router.put('/customers/:id', authorize('retention.write'), validate(IdParamsSchema, 'params'), validate(RuleUpdateSchema), putCustomerRule);
  router.put('/orders/:id', authorize('retention.write'), validate(IdParamsSchema, 'params'), validate(RuleUpdateSchema), putOrderRule);
  router.get('/orders/:id', authorize('lab.read'), validate(IdParamsSchema, 'params'), getOrderRule);
  router.get('/due', authorize('lab.read'), validate(DueQuerySchema, 'query'), getDue);
  router.get('/items/:code', authorize('lab.read'), getItemRetention);
  router.post('/digest', authorize('retention.write'), validate(DigestRunSchema), postDigest);
  return router;
}
