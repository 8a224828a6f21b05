import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { LoginBody, MeResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';
import { authQueries } from './queries';

/** Signs in; the answer is the same as /me, so the cache is primed without another round trip. */
export function useSignIn() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: LoginBody) => api<MeResponse>('/auth/login', { method: 'POST', json: body }),
    onSuccess: (me) => {
      // Anything cached under another user must not show through.
      qc.removeQueries({ predicate: (q) => q.queryKey[0] !== 'auth' });
      qc.setQueryData(authQueries.me().queryKey, me);
    },
  });
}
