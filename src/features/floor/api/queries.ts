import { queryOptions } from '@tanstack/react-query';
import type { FloorView } from '../../../../shared/schemas/floor';
import { api } from '../../../lib/api-client';

/** Query builders for the Floor screen. */
export const floorQueries = {
  all: () => ['floor'] as const,
  view: () => queryOptions({ queryKey: [...floorQueries.all(), 'view'], queryFn: () => api<FloorView>('/floor'), refetchInterval: 30_000 }),
};
