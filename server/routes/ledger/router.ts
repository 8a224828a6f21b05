import { Router } from 'express';
import { authorize } from '../../middleware/auth';
import { getSeals, getVerify } from './handlers';

/** Ledger-wide checks. */
export function ledgerRouter(): Router {
  const router = Router();
  router.get('/verify', authorize('ledger.verify'), getVerify);
  router.get('/seals', authorize('ledger.verify'), getSeals);
  return router;
}
