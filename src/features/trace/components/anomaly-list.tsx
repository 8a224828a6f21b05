import type { TraceAnomaly } from '../../../../shared/schemas/trace';

const LOOK = {
  critical: { shape: 'M7 1 13.5 12.5H0.5Z', tone: 'bg-stop-100 text-stop-700 ring-stop-500', word: 'Critical' },
  warning: { shape: 'M7 1 13 7 7 13 1 7Z', tone: 'bg-warn-100 text-warn-700 ring-warn-500', word: 'Warning' },
  info: { shape: 'M2 2H12V12H2Z', tone: 'bg-ink-100 text-ink-800 ring-ink-300', word: 'Note' },
} as const;

/** A severity by word and shape: triangle critical, diamond warning, square note. */
export function SeverityTag({ severity }: { severity: TraceAnomaly['severity'] }) {
  const look = LOOK[severity];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-caption font-semibold ring-1 ring-inset ${look.tone}`} data-severity={severity}>
      <svg width="10" height="10" viewBox="0 0 14 14" aria-hidden>
        <path d={look.shape} fill="currentColor" />
      </svg>
      {look.word}
    </span>
  );
}

/** The anomalies found on a trace, most serious first. */
export function AnomalyList({ anomalies }: { anomalies: readonly TraceAnomaly[] }) {
  if (anomalies.length === 0) return <p className="text-body text-good-700">● No anomalies found.</p>;
  return (
    <ul className="flex flex-col gap-3" data-testid="anomalies">
      {anomalies.map((a, i) => (
        <li key={`${a.item}-${a.code}-${a.eventSeq ?? 'x'}-${i}`} className="flex flex-col gap-1">
          <span className="flex flex-wrap items-center gap-2">
            <SeverityTag severity={a.severity} />
            <span className="text-body font-semibold text-ink-900">{a.code.replace(/_/g, ' ')}</span>
            <span className="font-mono text-caption text-ink-500">
              {a.item}
              {a.eventSeq ? ` seq ${a.eventSeq}` : ''}
            </span>
          </span>
          <span className="text-body text-ink-700">{a.message}</span>
        </li>
      ))}
    </ul>
  );
}
