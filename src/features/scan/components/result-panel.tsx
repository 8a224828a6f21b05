import { useEffect, useRef } from 'react';
import { StateBadge } from '../../../components/ui/state-badge';
import type { ItemView } from '../api/types';
import type { ScanResult } from '../results';
import { OutcomeMark } from './outcome-mark';
import { PrintLabelsLink } from '../../labels/components/print-labels-link';

const TONE: Record<ScanResult['outcome'], string> = {
  accepted: 'bg-good-100 text-good-700 ring-good-500',
  already: 'bg-ink-100 text-ink-800 ring-ink-400',
  refused: 'bg-stop-100 text-stop-700 ring-stop-500',
  kept: 'bg-straw-100 text-straw-700 ring-straw-500',
  info: 'bg-temper-50 text-temper-800 ring-temper-300',
};

/**
 * The large answer to the last scan: a shape and a word for the outcome (never colour alone), the
 * code, what the item is and what may come next. It times itself from the scan's last key to the
 * frame that shows it (data-latency-ms), for the speed check.
 */
export function ResultPanel({ result, details, feedbackName }: { result: ScanResult | null; details: ItemView | null; feedbackName?: string }) {
  const ref = useRef<HTMLElement>(null);
  useEffect(() => {
    // The panel stays mounted from one result to the next: a result that was not a timed scan
    // must not keep the last one's figure.
    ref.current?.removeAttribute('data-latency-ms');
    const started = result?.scannedAt;
    if (started == null) return;
    const frame = requestAnimationFrame(() => {
      ref.current?.setAttribute('data-latency-ms', (performance.now() - started).toFixed(1));
    });
    return () => cancelAnimationFrame(frame);
  }, [result]);

  if (!result) {
    return (
      <section aria-live="polite" className="rounded-card border-2 border-dashed border-ink-200 p-5 text-center text-body text-ink-500" data-testid="scan-result">
        Scan a label, or type its code below.
      </section>
    );
  }
  return (
    <section
      ref={ref}
      aria-live="assertive"
      data-testid="scan-result"
      data-outcome={result.outcome}
      data-serial={result.serial}
      data-code={result.code ?? undefined}
      data-feedback={feedbackName}
      className={`rounded-card p-4 ring-2 ring-inset ${TONE[result.outcome]}`}
    >
      <div className="flex items-center gap-4">
        <OutcomeMark outcome={result.outcome} />
        <div className="min-w-0">
          <h2 className="text-display leading-tight" data-testid="scan-title">{result.title}</h2>
          {result.code ? <p className="break-all font-mono text-lead font-semibold">{result.code}</p> : null}
        </div>
      </div>
      <p className="mt-3 text-lead" data-testid="scan-message">{result.message}</p>
      {result.item ? (
        <p className="mt-2 flex flex-wrap items-center gap-2 text-body">
          <span>State:</span>
          <StateBadge state={result.item.state} />
        </p>
      ) : null}
      {details?.specimen ? (
        <dl className="mt-2 grid grid-cols-[auto_1fr] gap-x-3 text-body" data-testid="scan-details">
          <dt className="font-semibold">Heat</dt>
          <dd className="font-mono">{details.specimen.heat ?? '—'}</dd>
          <dt className="font-semibold">Order</dt>
          <dd className="font-mono">{details.specimen.order ?? '—'}</dd>
          <dt className="font-semibold">Where</dt>
          <dd>{details.location.text}</dd>
        </dl>
      ) : details?.container ? (
        <p className="mt-2 text-body" data-testid="scan-details">{details.container.name} · holds {details.container.contents}</p>
      ) : null}
      {result.flags.length > 0 ? (
        <ul className="mt-2 text-body font-semibold">
          {result.flags.map((f) => (
            <li key={f}><span aria-hidden>▲ </span>{f}</li>
          ))}
        </ul>
      ) : null}
      {result.next.length > 0 ? (
        <p className="mt-2 text-body" data-testid="scan-next">
          <span className="font-semibold">What may come next: </span>
          {result.next.join(', ')}.
        </p>
      ) : result.outcome === 'refused' && result.item ? (
        <p className="mt-2 text-body" data-testid="scan-next">Nothing more may happen to it.</p>
      ) : null}
      {result.halfB ? (
        <a
          href={`/labels?kind=half&codes=${encodeURIComponent(result.halfB)}`}
          className="mt-3 flex h-14 items-center justify-center rounded-md bg-ink-900 px-4 text-lead font-semibold text-white"
          data-testid="half-b-label"
        >
          Print half-B label · <span className="ml-1 font-mono">{result.halfB}</span>
        </a>
      ) : null}
      {result.item?.kind === 'container' && result.code && result.outcome !== 'refused' ? (
        <div className="mt-3">
          <PrintLabelsLink kind="container" codes={[result.code]} label="Print container label" size="lg" />
        </div>
      ) : null}
    </section>
  );
}
