import { Router } from 'express';
import { LoginSchema } from '../../../shared/schemas/auth';
import { publicRoute, signedIn } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getMe, login, logout } from './handlers';

/** Sign-in, sign-out and who-am-I. */
export function authRouter(): Router {
  const router = Router();
  router.post('/login', publicRoute(), validate(LoginSchema), login);
  router.post('/logout', publicRoute(), logout);
  router.get('/me', signedIn(), getMe);
  return router;
}
