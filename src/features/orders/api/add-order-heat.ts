import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { HeatView } from '../../../../shared/schemas/heats';
import type { OrderHeatAdd } from '../../../../shared/schemas/orders';
import { api } from '../../../lib/api-client';
import { INTAKE_ROOTS } from './queries';

/** Puts an existing heat, or a new one, on an order. */
export function useAddOrderHeat(orderId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: OrderHeatAdd) => api<HeatView>(`/orders/${orderId}/heats`, { method: 'POST', json: body }),
    onSuccess: () => Promise.all(INTAKE_ROOTS.map((queryKey) => client.invalidateQueries({ queryKey }))),
  });
}
