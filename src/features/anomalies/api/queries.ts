import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { AnomalyPage } from '../../../../shared/schemas/trace';
import { api } from '../../../lib/api-client';

/** Filters of the lab-wide list, as they sit in the URL. */
export interface AnomalyFilters {
  page: number;
  severity?: 'info' | 'warning' | 'critical';
}

/** Query keys and options for the lab-wide anomaly list, broad to narrow. */
export const anomalyQueries = {
  all: () => ['anomalies'] as const,
  list: (filters: AnomalyFilters) =>
    queryOptions({
      queryKey: [...anomalyQueries.all(), 'list', filters] as const,
      queryFn: () => {
        const params = new URLSearchParams({ page: String(filters.page), pageSize: '50' });
        if (filters.severity) params.set('severity', filters.severity);
        return api<AnomalyPage>(`/anomalies?${params.toString()}`);
      },
      placeholderData: keepPreviousData,
    }),
};
