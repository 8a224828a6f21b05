import { Router } from 'express';
import { authRouter } from './auth/router';
import { healthRouter } from './health/router';

/** Mounts every resource router under /api. */
export function apiRouter(): Router {
  const router = Router();
  router.use('/health', healthRouter());
  router.use('/auth', authRouter());
  return router;
}
