import { queryOptions, useMutation, useQuery } from '@tanstack/react-query';
import { LABEL_HEADERS, type LabelPrintRequest, type LabelStocksResponse } from '../../../../shared/schemas/labels';
import { api, ApiError } from '../../../lib/api-client';

/** Query keys and options for labels. */
export const labelQueries = {
  all: () => ['labels'] as const,
  stocks: () =>
    queryOptions({
      queryKey: [...labelQueries.all(), 'stocks'] as const,
      queryFn: () => api<LabelStocksResponse>('/labels/stocks'),
      staleTime: Infinity,
    }),
};

/** The rolls and sheets the server prints on. */
export function useLabelStocks() {
  return useQuery(labelQueries.stocks());
}

/** A PDF the server made: every label in it is already recorded as printed in the ledger. */
export interface PrintedLabels {
  pdf: Blob;
  labels: number;
  events: number;
  /** Codes that had been printed before. */
  reprinted: string[];
  /** The file name the server suggests. */
  fileName: string;
}

function csrfToken(): string | undefined {
  return document.cookie
    .split('; ')
    .find((c) => c.startsWith('hm_csrf='))
    ?.slice('hm_csrf='.length);
}

/**
 * Asks the server for a PDF of labels. The shared api() reads JSON only; this reads the PDF as a
 * blob and turns an error answer into the same ApiError.
 */
export async function printLabels(request: LabelPrintRequest): Promise<PrintedLabels> {
  const headers = new Headers({ 'Content-Type': 'application/json', Accept: 'application/pdf' });
  const token = csrfToken();
  if (token) headers.set('X-CSRF-Token', token);
  let res: Response;
  try {
    res = await fetch('/api/labels', { method: 'POST', credentials: 'same-origin', headers, body: JSON.stringify(request) });
  } catch {
    throw new ApiError(0, 'network', 'The server cannot be reached. Check the connection and try again.');
  }
  if (!res.ok) {
    const body = (res.headers.get('content-type') ?? '').includes('application/json') ? await res.json() : null;
    const e = body?.error;
    throw new ApiError(res.status, e?.code ?? `http_${res.status}`, e?.message ?? `The server answered ${res.status}.`, e?.details);
  }
  const disposition = res.headers.get('content-disposition') ?? '';
  const reprinted = res.headers.get(LABEL_HEADERS.reprinted);
  return {
    pdf: await res.blob(),
    labels: Number(res.headers.get(LABEL_HEADERS.labels) ?? 0),
    events: Number(res.headers.get(LABEL_HEADERS.events) ?? 0),
    reprinted: reprinted ? reprinted.split(',') : [],
    fileName: /filename="([^"]+)"/.exec(disposition)?.[1] ?? 'halfmark-labels.pdf',
  };
}

/** Prints labels (makes the PDF and records the prints). */
export function usePrintLabels() {
  return useMutation({ mutationFn: printLabels });
}
