import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { SpecificationCreate, SpecificationList, SpecificationView } from '../../../../shared/schemas/specifications';
import { api } from '../../../lib/api-client';

/** Query keys and options for specifications. */
export const specificationQueries = {
  all: () => ['specifications'] as const,
  list: () => queryOptions({ queryKey: [...specificationQueries.all(), 'list'] as const, queryFn: () => api<SpecificationList>('/specifications') }),
};

/** Adds a specification (lab managers). */
export function useAddSpecification() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: SpecificationCreate) => api<SpecificationView>('/specifications', { method: 'POST', json: body }),
    onSuccess: () => client.invalidateQueries({ queryKey: specificationQueries.all() }),
  });
}
