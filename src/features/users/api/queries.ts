import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page, UserListQuery, UserView } from '../../../../shared/schemas/users';
import { api } from '../../../lib/api-client';

/** The list filters as they live in the URL. */
export type UserFilters = Partial<Pick<UserListQuery, 'q' | 'role' | 'active' | 'sort' | 'page' | 'pageSize'>>;

function toSearch(filters: UserFilters): string {
  const params = new URLSearchParams();
  for (const [k, v] of Object.entries(filters)) if (v !== undefined && v !== '') params.set(k, String(v));
  const s = params.toString();
  return s ? `?${s}` : '';
}

/** Query keys and options for people, broad to narrow. */
export const userQueries = {
  all: () => ['users'] as const,
  lists: () => [...userQueries.all(), 'list'] as const,
  list: (filters: UserFilters) =>
    queryOptions({
      queryKey: [...userQueries.lists(), filters] as const,
      queryFn: () => api<Page<UserView>>(`/users${toSearch(filters)}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: number) => queryOptions({ queryKey: [...userQueries.all(), 'detail', id] as const, queryFn: () => api<UserView>(`/users/${id}`) }),
};
