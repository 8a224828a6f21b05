import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { SearchResult } from '../../../../shared/schemas/trace';
import { api } from '../../../lib/api-client';

/** Query keys and options for the one search box, keyed by the text searched. */
export const searchQueries = {
  all: () => ['search'] as const,
  results: (q: string) =>
    queryOptions({
      queryKey: [...searchQueries.all(), q] as const,
      queryFn: () => api<SearchResult>(`/search?q=${encodeURIComponent(q)}`),
      enabled: q.trim().length >= 2,
      placeholderData: keepPreviousData,
      staleTime: 10_000,
    }),
};
