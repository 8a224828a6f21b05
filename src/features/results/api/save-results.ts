import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { RawRecordView, ResultsEntry, SpecimenResultsView } from '../../../../shared/schemas/results';
import { api } from '../../../lib/api-client';
import { resultsQueries } from './queries';

/** Computes and stores a specimen's results; the answer replaces the cached view. */
export function useSaveResults(code: string) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (entry: ResultsEntry) => api<SpecimenResultsView>(`/results/specimens/${encodeURIComponent(code)}`, { method: 'POST', json: entry }),
    onSuccess: (view) => {
      client.setQueryData(resultsQueries.specimen(code).queryKey, view);
      void client.invalidateQueries({ queryKey: [...resultsQueries.all(), 'order'] });
    },
  });
}

/** What the mapping step sends with the file. */
export interface RecordMapping {
  force: string;
  extension: string;
  time?: string;
  forceUnit: string;
  extensionUnit: string;
  gaugeLength: string;
  gaugeLengthUnit: string;
  delimiter?: string;
  fileName?: string;
}

/** Uploads a raw record as CSV text, its mapping in the address. */
export function useUploadRecord(code: string) {
  return useMutation({
    mutationFn: ({ csv, mapping }: { csv: string; mapping: RecordMapping }) => {
      const query = new URLSearchParams(Object.entries(mapping).filter((e): e is [string, string] => typeof e[1] === 'string' && e[1] !== ''));
      return api<{ rawRecord: RawRecordView }>(`/results/specimens/${encodeURIComponent(code)}/records?${query.toString()}`, {
        method: 'POST',
        body: csv,
        headers: { 'Content-Type': 'text/csv' },
      });
    },
  });
}
