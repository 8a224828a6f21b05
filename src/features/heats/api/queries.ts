import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { HeatDetail, HeatView } from '../../../../shared/schemas/heats';
import type { Page } from '../../../../shared/schemas/intake-common';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** Query keys and options for heats, broad to narrow. */
export const heatQueries = {
  all: () => ['heats'] as const,
  lists: () => [...heatQueries.all(), 'list'] as const,
  list: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...heatQueries.lists(), query] as const,
      queryFn: () => api<Page<HeatView>>(`/heats${toQueryString(query)}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: number) =>
    queryOptions({
      queryKey: [...heatQueries.all(), 'detail', id] as const,
      queryFn: () => api<HeatDetail>(`/heats/${id}`),
    }),
};
