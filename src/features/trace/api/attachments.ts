import { useMutation, useQueryClient } from '@tanstack/react-query';
import type { AttachmentCategory, AttachmentUploadResult } from '../../../../shared/schemas/attachments';
import { api } from '../../../lib/api-client';
import { traceQueries } from './queries';

/** What the item page sends with one file. */
export interface AttachmentUpload {
  itemCode: string;
  file: File;
  /** Left out when the file's type is not one Halfmark keeps: the server then names what it accepts. */
  category?: AttachmentCategory;
  note?: string;
  /** One key per chosen file, so a retried upload records a single `attached` event. */
  idempotencyKey: string;
}

/**
 * Sends one file to POST /api/attachments as multipart form data, with the item's code so the
 * server records the `attached` event. Goes through {@link api}, which adds the CSRF header and
 * turns the server's refusals (size, type, content) into ApiError.
 */
export function uploadAttachment(upload: AttachmentUpload): Promise<AttachmentUploadResult> {
  const form = new FormData();
  form.set('itemCode', upload.itemCode);
  if (upload.category) form.set('category', upload.category);
  if (upload.note) form.set('note', upload.note);
  form.set('idempotencyKey', upload.idempotencyKey);
  // Text fields before the file, so the server has them in hand when the file's bytes arrive.
  form.set('file', upload.file, upload.file.name);
  return api<AttachmentUploadResult>('/attachments', { method: 'POST', body: form });
}

/** Uploads a file to an item and refreshes the traces once it is stored (a half's file shows on its specimen's trace too). */
export function useUploadAttachment() {
  const queryClient = useQueryClient();
  return useMutation({
    mutationFn: uploadAttachment,
    onSuccess: () => queryClient.invalidateQueries({ queryKey: traceQueries.all() }),
  });
}
