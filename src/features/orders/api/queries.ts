import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page } from '../../../../shared/schemas/intake-common';
import type { OrderDetail, OrderView } from '../../../../shared/schemas/orders';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** Query keys and options for orders, broad to narrow. */
export const orderQueries = {
  all: () => ['orders'] as const,
  lists: () => [...orderQueries.all(), 'list'] as const,
  list: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...orderQueries.lists(), query] as const,
      queryFn: () => api<Page<OrderView>>(`/orders${toQueryString(query)}`),
      placeholderData: keepPreviousData,
    }),
  detail: (id: number) =>
    queryOptions({
      queryKey: [...orderQueries.all(), 'detail', id] as const,
      queryFn: () => api<OrderDetail>(`/orders/${id}`),
    }),
};

/**
 * Every intake list and page a change to an order can touch: its heats, samples and specimens
 * show counts and links to it.
 */
export const INTAKE_ROOTS = [['orders'], ['heats'], ['samples'], ['specimens'], ['customers']] as const;
