import type { TraceView } from '../../../../shared/schemas/trace';
import { ATTACHMENT_CATEGORY_LABELS, describeBytes } from '../../../../shared/schemas/attachments';

/** The item's files: photos shown, video played (seeking through byte ranges), other files linked. */
export function Attachments({ trace }: { trace: TraceView }) {
  if (trace.attachments.length === 0) return <p className="text-body text-ink-500">No files are attached.</p>;
  return (
    <ul className="grid grid-cols-1 gap-4 md:grid-cols-2">
      {trace.attachments.map((a) => (
        <li key={`${a.item}-${a.seq}`} className="flex flex-col gap-2 rounded-md p-2 ring-1 ring-ink-100" data-testid="attachment">
          {a.display === 'image' ? (
            <a href={a.href} target="_blank" rel="noreferrer">
              <img src={a.href} alt={`${ATTACHMENT_CATEGORY_LABELS[a.category]}: ${a.fileName}`} className="max-h-72 w-full rounded object-contain bg-ink-50" loading="lazy" />
            </a>
          ) : a.display === 'video' ? (
            <video src={a.href} controls preload="metadata" className="max-h-72 w-full rounded bg-ink-900">
              <a href={a.href}>Download {a.fileName}</a>
            </video>
          ) : (
            <a href={a.href} className="font-semibold text-temper-700 hover:underline" download={a.fileName}>
              ⇩ {a.fileName}
            </a>
          )}
          <p className="text-caption text-ink-600">
            {ATTACHMENT_CATEGORY_LABELS[a.category]} · {a.fileName} · {describeBytes(a.size)} · <span className="font-mono">{a.item}</span> seq {a.seq}
            {a.note ? ` · ${a.note}` : ''}
          </p>
          <p className="break-all font-mono text-caption text-ink-500" title="SHA-256">
            {a.sha256}
          </p>
        </li>
      ))}
    </ul>
  );
}
