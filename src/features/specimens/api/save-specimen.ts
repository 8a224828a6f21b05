import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SpecimenCreate, SpecimenDetail, SpecimenUpdate } from '../../../../shared/schemas/specimens';
import { api } from '../../../lib/api-client';

/** Registers one specimen cut from a sample; sample, order and heat pages count specimens too. */
export function useCreateSpecimen() {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: SpecimenCreate) => api<SpecimenDetail>('/specimens', { method: 'POST', json: body }),
    onSuccess: () => Promise.all([['specimens'], ['samples'], ['orders'], ['heats']].map((queryKey) => client.invalidateQueries({ queryKey }))),
  });
}

/** Changes a registered specimen's geometry or standard. */
export function useUpdateSpecimen(idOrCode: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: SpecimenUpdate) => api<SpecimenDetail>(`/specimens/${encodeURIComponent(idOrCode)}`, { method: 'PATCH', json: body }),
    onSuccess: () => client.invalidateQueries({ queryKey: ['specimens'] }),
  });
}
