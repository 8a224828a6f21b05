import { queryOptions } from '@tanstack/react-query';
import type { TraceView } from '../../../../shared/schemas/trace';
import { api } from '../../../lib/api-client';

/** Query keys and options for item traces, broad to narrow; `files` says whether stored files are re-hashed. */
export const traceQueries = {
  all: () => ['trace'] as const,
  detail: (code: string, files: 'presence' | 'rehash' = 'presence') =>
    queryOptions({
      queryKey: [...traceQueries.all(), 'detail', code, files] as const,
      queryFn: () => api<TraceView>(`/items/${encodeURIComponent(code)}/trace${files === 'rehash' ? '?files=rehash' : ''}`),
      staleTime: 15_000,
    }),
};

/** Where the audit pack of an item downloads from. */
export function auditPackHref(code: string, format: 'pdf' | 'jsonl'): string {
  return `/api/items/${encodeURIComponent(code)}/audit.${format}`;
}
