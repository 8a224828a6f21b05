import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { HoldView } from '../../../../shared/schemas/holds';
import type { DueListView, RetentionSettingsView } from '../../../../shared/schemas/retention';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** Query keys and options for retention: the due list, the lab's settings and the holds. */
export const retentionQueries = {
  all: () => ['retention'] as const,
  due: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...retentionQueries.all(), 'due', query] as const,
      queryFn: () => api<DueListView>(`/retention/due${toQueryString(query)}`),
      placeholderData: keepPreviousData,
    }),
  settings: () =>
    queryOptions({
      queryKey: [...retentionQueries.all(), 'settings'] as const,
      queryFn: () => api<RetentionSettingsView>('/retention/settings'),
    }),
  holds: (active: boolean | null) =>
    queryOptions({
      queryKey: [...retentionQueries.all(), 'holds', active] as const,
      queryFn: () => api<{ items: HoldView[] }>(`/holds${active === null ? '' : `?active=${active}`}`),
    }),
};
