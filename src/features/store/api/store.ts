import { queryOptions } from '@tanstack/react-query';
import type { PutAwayOutcome, StoreTreeView } from '../../../../shared/schemas/retention';
import { api } from '../../../lib/api-client';

/** Query keys and options for the store. */
export const storeQueries = {
  all: () => ['store'] as const,
  tree: () =>
    queryOptions({
      queryKey: [...storeQueries.all(), 'tree'] as const,
      queryFn: () => api<StoreTreeView>('/store/tree'),
    }),
};

/** Puts scanned items (or bags and boxes) into one container through the ledger. */
export function putAway(into: string, codes: readonly string[]): Promise<{ into: string; outcomes: PutAwayOutcome[]; recorded: number }> {
  return api('/store/put-away', { method: 'POST', json: { into, codes } });
}
