import type { BatchLine } from '../../../../shared/schemas/disposals';
import { Button } from '../../../components/ui/button';

const STATUS_TEXT: Record<BatchLine['status'], { label: string; glyph: string; tone: string }> = {
  may_go: { label: 'May go', glyph: '◆', tone: 'text-good-700' },
  not_due: { label: 'Not due', glyph: '○', tone: 'text-stop-700' },
  held: { label: 'Held', glyph: '▲', tone: 'text-warn-700' },
  not_retained: { label: 'Not retained', glyph: '■', tone: 'text-stop-700' },
  duplicate: { label: 'Scanned twice', glyph: '▲', tone: 'text-stop-700' },
  other_order: { label: 'Other order', glyph: '▲', tone: 'text-stop-700' },
  other_customer: { label: 'Other customer', glyph: '▲', tone: 'text-stop-700' },
  unknown: { label: 'Unknown', glyph: '▲', tone: 'text-stop-700' },
  invalid: { label: 'Not an item', glyph: '▲', tone: 'text-stop-700' },
};

/** The scanned items of a batch, each with the server's verdict and a way to take it out. */
export function BatchLines({ codes, lines, onRemove }: { codes: readonly string[]; lines: readonly BatchLine[] | undefined; onRemove: (index: number) => void }) {
  if (codes.length === 0) return <p className="rounded-card bg-white p-4 text-ink-500 ring-1 ring-ink-100">Nothing scanned yet.</p>;
  return (
    <ol className="flex flex-col divide-y divide-ink-100 rounded-card bg-white ring-1 ring-ink-100" aria-label="Scanned items">
      {codes.map((code, i) => {
        // A line belongs to this row only if it answers this very scan (the list may have changed since).
        const candidate = lines?.[i];
        const line = candidate?.scanned === code ? candidate : undefined;
        const look = line ? STATUS_TEXT[line.status] : null;
        return (
          <li key={`${code}-${i}`} className="flex flex-wrap items-start gap-3 p-3" data-code={code} data-status={line?.status ?? 'checking'}>
            <span className="w-6 text-caption text-ink-500">{i + 1}</span>
            <span className="min-w-0 flex-1">
              <span className="block font-mono text-lead">{line?.code ?? code}</span>
              {line?.order ? (
                <span className="block text-caption text-ink-500">
                  {line.kind === 'half' ? `half of ${line.specimen ?? ''} · ` : ''}order {line.order} · heat {line.heat} · {line.location}
                </span>
              ) : null}
              {line && !line.ok ? <span className="block text-caption font-semibold text-stop-700">{line.message}</span> : null}
            </span>
            <span className={`font-semibold ${look?.tone ?? 'text-ink-500'}`}>
              {look ? (
                <>
                  <span aria-hidden>{look.glyph} </span>
                  {look.label}
                </>
              ) : (
                'Checking …'
              )}
            </span>
            <Button variant="ghost" size="sm" onClick={() => onRemove(i)} aria-label={`Take ${code} out of the batch`}>
              Remove
            </Button>
          </li>
        );
      })}
    </ol>
  );
}
