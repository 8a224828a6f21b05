import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CustomerCreate, CustomerUpdate, CustomerView } from '../../../../shared/schemas/customers';
import { api } from '../../../lib/api-client';
import { customerQueries } from './queries';

/** Creates a customer (no id) or changes one (with its id). */
export function useSaveCustomer(id?: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: CustomerCreate | CustomerUpdate) =>
      id === undefined
        ? api<CustomerView>('/customers', { method: 'POST', json: body })
        : api<CustomerView>(`/customers/${id}`, { method: 'PATCH', json: body }),
    onSuccess: () => client.invalidateQueries({ queryKey: customerQueries.all() }),
  });
}
