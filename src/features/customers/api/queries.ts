import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { CustomerView } from '../../../../shared/schemas/customers';
import type { Page } from '../../../../shared/schemas/intake-common';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** A customer on its own page: with whether the caller may change it. */
export type CustomerDetail = CustomerView & { canWrite: boolean };

/** Query keys and options for customers, broad to narrow. */
export const customerQueries = {
  all: () => ['customers'] as const,
  lists: () => [...customerQueries.all(), 'list'] as const,
  list: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...customerQueries.lists(), query] as const,
      queryFn: () => api<Page<CustomerView>>(`/customers${toQueryString(query)}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: number) =>
    queryOptions({
      queryKey: [...customerQueries.all(), 'detail', id] as const,
      queryFn: () => api<CustomerDetail>(`/customers/${id}`),
    }),
};
