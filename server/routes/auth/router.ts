import { Router } from 'express';
import { LinkInfoSchema, LoginSchema, ResetRequestSchema, SetPasswordSchema, SignatureSchema } from '../../../shared/schemas/auth';
import { ChangePasswordSchema, SetPinSchema } from '../../../shared/schemas/users';
import { authorize, publicRoute, signedIn } from '../../middleware/auth';
import { passwordRateLimit } from '../../middleware/rate-limit';
import { validate } from '../../middleware/validate';
import { changePassword, clearPin, getMe, linkInfo, login, logout, requestReset, setPassword, setPin, sign } from './handlers';

/** Sign-in, sign-out, who-am-I, one's own password and PIN, e-mailed links, and signatures. */
export function authRouter(): Router {
  const router = Router();
  router.post('/login', publicRoute(), passwordRateLimit(), validate(LoginSchema), login);
  router.post('/logout', publicRoute(), logout);
  router.get('/me', signedIn(), getMe);
  router.post('/signature', signedIn(), passwordRateLimit(), validate(SignatureSchema), sign);
  router.post('/password', authorize('session.self'), passwordRateLimit(), validate(ChangePasswordSchema), changePassword);
  router.put('/pin', authorize('session.self'), passwordRateLimit(), validate(SetPinSchema), setPin);
  router.delete('/pin', authorize('session.self'), clearPin);
  router.post('/password-reset', publicRoute(), passwordRateLimit(), validate(ResetRequestSchema), requestReset);
  router.post('/link', publicRoute(), validate(LinkInfoSchema), linkInfo);
  router.post('/set-password', publicRoute(), passwordRateLimit(), validate(SetPasswordSchema), setPassword);
  return router;
}
