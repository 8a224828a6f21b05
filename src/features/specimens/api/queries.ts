import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { Page } from '../../../../shared/schemas/intake-common';
import type { SpecimenDetail, SpecimenView } from '../../../../shared/schemas/specimens';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** Query keys and options for specimens, broad to narrow; a detail is keyed by id or code. */
export const specimenQueries = {
  all: () => ['specimens'] as const,
  lists: () => [...specimenQueries.all(), 'list'] as const,
  list: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...specimenQueries.lists(), query] as const,
      queryFn: () => api<Page<SpecimenView>>(`/specimens${toQueryString(query)}`),
      placeholderData: keepPreviousData,
    }),
  detail: (idOrCode: string) =>
    queryOptions({
      queryKey: [...specimenQueries.all(), 'detail', idOrCode] as const,
      queryFn: () => api<SpecimenDetail>(`/specimens/${encodeURIComponent(idOrCode)}`),
    }),
};
