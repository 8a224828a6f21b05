import { queryOptions } from '@tanstack/react-query';
import type { SpecimenResultsView } from '../../../../shared/schemas/results';
import type { OrderResultsView } from '../../../../shared/schemas/reports';
import { api } from '../../../lib/api-client';

/** Query keys and options for results, broad to narrow. */
export const resultsQueries = {
  all: () => ['results'] as const,
  specimen: (code: string) =>
    queryOptions({
      queryKey: [...resultsQueries.all(), 'specimen', code] as const,
      queryFn: () => api<SpecimenResultsView>(`/results/specimens/${encodeURIComponent(code)}`),
    }),
  order: (orderId: number) =>
    queryOptions({
      queryKey: [...resultsQueries.all(), 'order', orderId] as const,
      queryFn: () => api<OrderResultsView>(`/reports/orders/${orderId}`),
    }),
};
