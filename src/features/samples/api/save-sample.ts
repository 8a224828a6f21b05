import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { SampleCreate, SampleUpdate, SampleView } from '../../../../shared/schemas/samples';
import { api } from '../../../lib/api-client';

/** Registers a sample (no id) or changes one (with its id); order and heat pages count samples too. */
export function useSaveSample(id?: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: SampleCreate | SampleUpdate) =>
      id === undefined ? api<SampleView>('/samples', { method: 'POST', json: body }) : api<SampleView>(`/samples/${id}`, { method: 'PATCH', json: body }),
    onSuccess: () => Promise.all([['samples'], ['orders'], ['heats']].map((queryKey) => client.invalidateQueries({ queryKey }))),
  });
}
