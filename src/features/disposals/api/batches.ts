import { keepPreviousData, queryOptions } from '@tanstack/react-query';
import type { SignatureMeaning, SignatureResponse } from '../../../../shared/schemas/auth';
import type { BatchCheckView, BatchKind, BatchSummary, BatchView } from '../../../../shared/schemas/disposals';
import type { Page } from '../../../../shared/schemas/intake-common';
import { toQueryString } from '../../../components/ui/data-table';
import { api } from '../../../lib/api-client';

/** Query keys and options for disposal and return batches. */
export const batchQueries = {
  all: () => ['disposals'] as const,
  check: (kind: BatchKind, codes: readonly string[], orderNumber: string) =>
    queryOptions({
      queryKey: [...batchQueries.all(), 'check', kind, codes, orderNumber] as const,
      queryFn: () =>
        api<BatchCheckView>('/disposals/check', { method: 'POST', json: { kind, codes, ...(orderNumber ? { orderNumber } : {}) } }),
      enabled: codes.length > 0,
      placeholderData: keepPreviousData,
    }),
  list: (query: Record<string, string | number>) =>
    queryOptions({
      queryKey: [...batchQueries.all(), 'list', query] as const,
      queryFn: () => api<Page<BatchSummary>>(`/disposals${toQueryString(query)}`),
    }),
};

/** Signs with the password again for one meaning; the token is good for one action, for five minutes. */
export function signFor(password: string, meaning: SignatureMeaning): Promise<SignatureResponse> {
  return api<SignatureResponse>('/auth/signature', { method: 'POST', json: { password, meaning } });
}

/** Records a signed batch. */
export function createBatch(body: {
  kind: BatchKind;
  codes: readonly string[];
  orderNumber?: string;
  recipient?: string;
  note?: string;
  signatureToken: string;
}): Promise<BatchView> {
  return api<BatchView>('/disposals', { method: 'POST', json: body });
}
