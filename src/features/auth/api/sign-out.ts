import { useMutation, useQueryClient } from '@tanstack/react-query';
import { api } from '../../../lib/api-client';
import { forgetSession } from '../last-session';

/** Signs out on this device and forgets everything cached for the user. */
export function useSignOut() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: () => api<null>('/auth/logout', { method: 'POST' }),
    onSettled: () => {
      forgetSession();
      qc.clear();
    },
  });
}
