import { useState, type FormEvent } from 'react';
import {
  ATTACHMENT_CATEGORY_LABELS,
  ATTACHMENT_TYPES,
  attachmentTypeOfName,
  describeAcceptedTypes,
  describeBytes,
  type AttachmentCategory,
} from '../../../../shared/schemas/attachments';
import { Button } from '../../../components/ui/button';
import { Field, FormAlert, SelectField, TextField } from '../../../components/ui/form-field';
import { ApiError } from '../../../lib/api-client';
import { useUploadAttachment } from '../api/attachments';

const ACCEPT = ATTACHMENT_TYPES.flatMap((t) => [t.mediaType, ...t.extensions]).join(',');

/**
 * A compact form that attaches one file (photo, raw data, video, conditioning log) to an item:
 * the server stores it under its SHA-256 and records an `attached` event; the trace then
 * refreshes so the file shows. Size and type are the server's to judge; its refusal shows here.
 */
export function AttachmentUpload({ itemCode }: { itemCode: string }) {
  const upload = useUploadAttachment();
  const [file, setFile] = useState<File | null>(null);
  const [category, setCategory] = useState<AttachmentCategory | ''>('');
  const [note, setNote] = useState('');
  const [key, setKey] = useState(() => crypto.randomUUID());
  // Bumped after a stored upload so the file input empties.
  const [round, setRound] = useState(0);
  const [done, setDone] = useState<string | null>(null);

  const allowed = file ? (attachmentTypeOfName(file.name)?.categories ?? []) : [];

  const choose = (next: File | null) => {
    setFile(next);
    setCategory(next ? (attachmentTypeOfName(next.name)?.categories[0] ?? '') : '');
    setKey(crypto.randomUUID());
    setDone(null);
    upload.reset();
  };

  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (!file) return;
    setDone(null);
    upload.mutate(
      { itemCode, file, category: category || undefined, note: note.trim() || undefined, idempotencyKey: key },
      {
        onSuccess: (result) => {
          // The store keeps identical bytes once, under the name they first came with; say so.
          const again = result.created ? '' : ' (the same file was already stored)';
          setDone(`Attached ${file.name}${result.event ? ` as event ${result.event.seq} of ${result.event.item}` : ''}${again}.`);
          setFile(null);
          setCategory('');
          setNote('');
          setKey(crypto.randomUUID());
          setRound((r) => r + 1);
        },
      },
    );
  };

  const error = upload.error ? (upload.error instanceof ApiError ? upload.error.message : 'The upload failed; try again.') : null;

  return (
    <form onSubmit={submit} className="mb-4 grid grid-cols-1 gap-3 rounded-md bg-ink-50 p-3 sm:grid-cols-2" data-testid="attachment-upload" aria-label="Attach a file">
      <Field label="File" hint={`Accepted: ${describeAcceptedTypes()}.`} className="sm:col-span-2">
        {({ id, describedBy }) => (
          <input
            key={round}
            id={id}
            type="file"
            accept={ACCEPT}
            aria-describedby={describedBy}
            disabled={upload.isPending}
            onChange={(e) => choose(e.target.files?.[0] ?? null)}
            className="text-body text-ink-800 file:mr-3 file:h-10 file:rounded-md file:border-0 file:bg-white file:px-4 file:font-semibold file:text-ink-900 file:ring-1 file:ring-inset file:ring-ink-300"
          />
        )}
      </Field>
      <SelectField
        label="Kind"
        value={category}
        onChange={(e) => setCategory(e.target.value as AttachmentCategory | '')}
        disabled={allowed.length < 2 || upload.isPending}
        options={allowed.map((c) => ({ value: c, label: ATTACHMENT_CATEGORY_LABELS[c] }))}
        placeholder={allowed.length === 0 ? 'Taken from the file' : undefined}
      />
      <TextField label="Note" value={note} maxLength={500} placeholder="e.g. fracture face, half A" onChange={(e) => setNote(e.target.value)} disabled={upload.isPending} />
      <div className="flex flex-wrap items-center gap-3 sm:col-span-2">
        <Button type="submit" disabled={!file} busy={upload.isPending} busyLabel="Uploading …">
          Attach
        </Button>
        {upload.isPending && file ? (
          <span role="status" className="text-caption text-ink-600">
            Sending {file.name} ({describeBytes(file.size)}) and hashing it; keep this page open.
          </span>
        ) : null}
        {done ? (
          <span role="status" className="text-caption font-semibold text-good-700" data-testid="attachment-upload-done">
            <span aria-hidden>● </span>
            {done}
          </span>
        ) : null}
      </div>
      {error ? (
        <div className="sm:col-span-2" data-testid="attachment-upload-error">
          <FormAlert>{error}</FormAlert>
        </div>
      ) : null}
    </form>
  );
}
