import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { InviteUserBody, UpdateUserBody, UserView } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';
import { userQueries } from './queries';

/** Invites a person by e-mail. */
export function useInviteUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: InviteUserBody) => api<UserView>('/users', { method: 'POST', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userQueries.all() }),
  });
}

/** Changes a person's name, role or active flag. */
export function useUpdateUser() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, ...body }: UpdateUserBody & { id: number }) => api<UserView>(`/users/${id}`, { method: 'PATCH', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userQueries.all() }),
  });
}

/** Unlocks or re-invites a person. */
export function useUserAction() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, action }: { id: number; action: 'unlock' | 'invite' }) => api<UserView>(`/users/${id}/${action}`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: userQueries.all() }),
  });
}
