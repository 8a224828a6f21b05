import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page } from '../../../../shared/schemas/intake-common';
import type { SampleDetail, SampleView } from '../../../../shared/schemas/samples';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** Query keys and options for samples, broad to narrow. */
export const sampleQueries = {
  all: () => ['samples'] as const,
  lists: () => [...sampleQueries.all(), 'list'] as const,
  list: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...sampleQueries.lists(), query] as const,
      queryFn: () => api<Page<SampleView>>(`/samples${toQueryString(query)}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: number) =>
    queryOptions({
      queryKey: [...sampleQueries.all(), 'detail', id] as const,
      queryFn: () => api<SampleDetail>(`/samples/${id}`),
    }),
};
