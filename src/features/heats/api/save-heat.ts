import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { HeatCreate, HeatUpdate, HeatView } from '../../../../shared/schemas/heats';
import { api } from '../../../lib/api-client';
import { heatQueries } from './queries';

/** Registers a heat (no id) or changes one (with its id). */
export function useSaveHeat(id?: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: HeatCreate | HeatUpdate) =>
      id === undefined ? api<HeatView>('/heats', { method: 'POST', json: body }) : api<HeatView>(`/heats/${id}`, { method: 'PATCH', json: body }),
    onSuccess: () => client.invalidateQueries({ queryKey: heatQueries.all() }),
  });
}
