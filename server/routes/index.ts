import { Router } from 'express';
import { healthRouter } from './health/router';

/** Mounts every resource router under /api. */
export function apiRouter(): Router {
  const router = Router();
  router.use('/health', healthRouter());
  return router;
}
