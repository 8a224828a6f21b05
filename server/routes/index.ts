import { Router } from 'express';
import { authRouter } from './auth/router';
import { healthRouter } from './health/router';
import { usersRouter } from './users/router';
import { stationsRouter } from './stations/router';
import { outboxRouter } from './outbox/router';
import { customersRouter } from './customers/router';
import { heatsRouter } from './heats/router';
import { ordersRouter } from './orders/router';
import { samplesRouter } from './samples/router';
import { specimensRouter } from './specimens/router';
import { eventsRouter } from './events/router';
import { itemsRouter } from './items/router';
import { ledgerRouter } from './ledger/router';
import { containersRouter } from './containers/router';
import { labelsRouter } from './labels/router';
import { resultsRouter } from './results/router';
import { specificationsRouter } from './specifications/router';
import { reportsRouter } from './reports/router';

/** Mounts every resource router under /api. */
export function apiRouter(): Router {
  const router = Router();
  router.use('/health', healthRouter());
  router.use('/auth', authRouter());
  router.use('/users', usersRouter());
  router.use('/stations', stationsRouter());
  router.use('/outbox', outboxRouter());
  router.use('/customers', customersRouter());
  router.use('/orders', ordersRouter());
  router.use('/heats', heatsRouter());
  router.use('/samples', samplesRouter());
  router.use('/specimens', specimensRouter());
  router.use('/events', eventsRouter());
  router.use('/items', itemsRouter());
  router.use('/ledger', ledgerRouter());
  router.use('/containers', containersRouter());
  router.use('/labels', labelsRouter());
  router.use('/results', resultsRouter());
  router.use('/specifications', specificationsRouter());
  router.use('/reports', reportsRouter());
  return router;
}
