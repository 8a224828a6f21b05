import { queryOptions, useQuery } from '@tanstack/react-query';
import type { Action } from '../../../../shared/permissions';
import type { MeResponse } from '../../../../shared/schemas/auth';
import { api } from '../../../lib/api-client';

/** Query keys and options for the session, broad to narrow. */
export const authQueries = {
  all: () => ['auth'] as const,
  me: () =>
    queryOptions({
      queryKey: [...authQueries.all(), 'me'] as const,
      queryFn: () => api<MeResponse>('/auth/me'),
      staleTime: 60_000,
    }),
};

/** Who is signed in, their role, and the actions the server says they may take. */
export function useMe() {
  return useQuery(authQueries.me());
}

/** Whether the signed-in user may take an action, read from /me (never from a copy of the rules). */
export function useCan(action: Action): boolean {
  const me = useMe();
  return me.data?.permissions.includes(action) ?? false;
}
