import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { CutListCreate, CutListPreview, CutListResult } from '../../../../shared/schemas/cut-list';
import { api } from '../../../lib/api-client';
import { INTAKE_ROOTS } from './queries';

function csvBody(file: File): FormData {
  const body = new FormData();
  body.append('file', file);
  return body;
}

/** Makes the order's cut list: one sample per heat and its specimens, all at once. */
export function useMakeCutList(orderId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (body: CutListCreate) => api<CutListResult>(`/orders/${orderId}/cut-list`, { method: 'POST', json: body }),
    onSuccess: () => Promise.all(INTAKE_ROOTS.map((queryKey) => client.invalidateQueries({ queryKey }))),
  });
}

/** Uploads a cut-list CSV and answers each row's errors; writes nothing. */
export function usePreviewCutList(orderId: number) {
  return useMutation({
    mutationFn: (file: File) => api<CutListPreview>(`/orders/${orderId}/cut-list/preview`, { method: 'POST', body: csvBody(file) }),
  });
}

/** Imports a cut-list CSV: every row or none. */
export function useImportCutList(orderId: number) {
  const client = useQueryClient();
  return useMutation({
    mutationFn: (file: File) => api<CutListResult>(`/orders/${orderId}/cut-list/import`, { method: 'POST', body: csvBody(file) }),
    onSuccess: () => Promise.all(INTAKE_ROOTS.map((queryKey) => client.invalidateQueries({ queryKey }))),
  });
}
