import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LinkInfoResponse, MeResponse, ResetRequestBody, SetPasswordBody } from '../../../../shared/schemas/auth';
import type { ChangePasswordBody, SetPinBody, UserView } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';
import { authQueries } from './queries';

/** Changes one's own password; other sessions end, this one carries on. */
export function useChangePassword() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: ChangePasswordBody) => api<MeResponse>('/auth/password', { method: 'POST', json: body }),
    onSuccess: (me) => qc.setQueryData(authQueries.me().queryKey, me),
  });
}

/** Sets one's PIN for shared stations. */
export function useSetPin() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: SetPinBody) => api<UserView>('/auth/pin', { method: 'PUT', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: authQueries.me().queryKey }),
  });
}

/** Asks for a password-reset e-mail. */
export function useRequestReset() {
  return useMutation({ mutationFn: (body: ResetRequestBody) => api<{ message: string }>('/auth/password-reset', { method: 'POST', json: body }) });
}

/** Reads what an e-mailed link is for. */
export function fetchLinkInfo(token: string): Promise<LinkInfoResponse> {
  return api<LinkInfoResponse>('/auth/link', { method: 'POST', json: { token } });
}

/** Spends an e-mailed link to set a password, which also signs in. */
export function useSetPassword() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: SetPasswordBody) => api<MeResponse>('/auth/set-password', { method: 'POST', json: body }),
    onSuccess: (me) => {
      qc.clear();
      qc.setQueryData(authQueries.me().queryKey, me);
    },
  });
}
