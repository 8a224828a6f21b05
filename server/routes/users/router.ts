import { Router } from 'express';
import { IdParamsSchema, InviteUserSchema, UpdateUserSchema, UserListQuerySchema } from '../../../shared/schemas/users';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getUser, inviteUser, listUsers, resendInvite, unlockUser, updateUser } from './handlers';

/** People: the list, invitations, role changes, deactivation and unlocking. */
export function usersRouter(): Router {
  const router = Router();
  router.get('/', authorize('users.read'), validate(UserListQuerySchema, 'query'), listUsers);
  router.post('/', authorize('users.write'), validate(InviteUserSchema), inviteUser);
  router.get('/:id', authorize('users.read'), validate(IdParamsSchema, 'params'), getUser);
  router.patch('/:id', authorize('users.write'), validate(IdParamsSchema, 'params'), validate(UpdateUserSchema), updateUser);
  router.post('/:id/unlock', authorize('users.write'), validate(IdParamsSchema, 'params'), unlockUser);
  router.post('/:id/invite', authorize('users.write'), validate(IdParamsSchema, 'params'), resendInvite);
  return router;
}
