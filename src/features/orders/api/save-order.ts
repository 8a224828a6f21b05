import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { OrderCreate, OrderUpdate, OrderView } from '../../../../shared/schemas/orders';
import { api } from '../../../lib/api-client';
import { INTAKE_ROOTS } from './queries';

/** Creates an order (no id) or changes one (with its id). */
export function useSaveOrder(id?: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: OrderCreate | OrderUpdate) =>
      id === undefined ? api<OrderView>('/orders', { method: 'POST', json: body }) : api<OrderView>(`/orders/${id}`, { method: 'PATCH', json: body }),
    onSuccess: () => Promise.all(INTAKE_ROOTS.map((queryKey) => client.invalidateQueries({ queryKey }))),
  });
}
