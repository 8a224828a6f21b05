import { queryOptions, useMutation, useQueryClient } from '@tanstack/react-query';
import type { CreateInstrumentTokenBody, CreateStationBody, InstrumentTokenView, StationView } from '../../../../shared/schemas/stations';
import { api } from '../../../lib/api-client';

/** Query keys and options for stations, broad to narrow. */
export const stationQueries = {
  all: () => ['stations'] as const,
  list: () => queryOptions({ queryKey: [...stationQueries.all(), 'list'] as const, queryFn: () => api<{ items: StationView[] }>('/stations') }),
  detail: (id: number) => queryOptions({ queryKey: [...stationQueries.all(), 'detail', id] as const, queryFn: () => api<StationView>(`/stations/${id}`) }),
};

/** Creates a station. */
export function useCreateStation() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateStationBody) => api<StationView>('/stations', { method: 'POST', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: stationQueries.all() }),
  });
}

/** Activates or deactivates a station. */
export function useSetStationActive() {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: ({ id, active }: { id: number; active: boolean }) => api<StationView>(`/stations/${id}`, { method: 'PATCH', json: { active } }),
    onSuccess: () => qc.invalidateQueries({ queryKey: stationQueries.all() }),
  });
}

/** Creates an instrument token; the answer holds the token, shown this once. */
export function useCreateToken(stationId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (body: CreateInstrumentTokenBody) => api<InstrumentTokenView & { token: string }>(`/stations/${stationId}/tokens`, { method: 'POST', json: body }),
    onSuccess: () => qc.invalidateQueries({ queryKey: stationQueries.all() }),
  });
}

/** Revokes an instrument token at once. */
export function useRevokeToken(stationId: number) {
  const qc = useQueryClient();
  return useMutation({
    mutationFn: (tokenId: number) => api<InstrumentTokenView>(`/stations/${stationId}/tokens/${tokenId}/revoke`, { method: 'POST' }),
    onSuccess: () => qc.invalidateQueries({ queryKey: stationQueries.all() }),
  });
}
