import { Link } from 'react-router-dom';
import type { AnomalyPage } from '../../../../shared/schemas/trace';
import { StateBadge } from '../../../components/ui/state-badge';
import { paths } from '../../../config/paths';

const SHAPES = {
  critical: { d: 'M7 1 13.5 12.5H0.5Z', tone: 'text-stop-700', word: 'Critical' },
  warning: { d: 'M7 1 13 7 7 13 1 7Z', tone: 'text-warn-700', word: 'Warning' },
  info: { d: 'M2 2H12V12H2Z', tone: 'text-ink-700', word: 'Note' },
} as const;

/** A severity by word and shape. */
export function Severity({ severity }: { severity: keyof typeof SHAPES }) {
  const s = SHAPES[severity];
  return (
    <span className={`inline-flex items-center gap-1.5 font-semibold ${s.tone}`} data-severity={severity}>
      <svg width="12" height="12" viewBox="0 0 14 14" aria-hidden>
        <path d={s.d} fill="currentColor" />
      </svg>
      {s.word}
    </span>
  );
}

/** One page of the lab-wide anomaly list; each row opens the item's trace. */
export function AnomalyTable({ page }: { page: AnomalyPage }) {
  if (page.items.length === 0) return <p className="p-4 text-body text-good-700">● No anomalies in this list.</p>;
  return (
    <ul className="divide-y divide-ink-100" data-testid="anomaly-rows">
      {page.items.map((a, i) => (
        <li key={`${a.item}-${a.code}-${a.eventSeq ?? 'x'}-${i}`} className="flex flex-col gap-1 px-3 py-3 md:flex-row md:items-start md:gap-4">
          <span className="w-24 shrink-0">
            <Severity severity={a.severity} />
          </span>
          <span className="flex w-52 shrink-0 flex-wrap items-center gap-2">
            <Link to={paths.trace.href(a.item)} className="font-mono font-semibold text-temper-700 hover:underline">
              {a.item}
            </Link>
            <StateBadge state={a.state} />
          </span>
          <span className="flex flex-col">
            <span className="text-body font-semibold text-ink-900">
              {a.code.replace(/_/g, ' ')}
              {a.eventSeq ? <span className="font-normal text-ink-500"> · seq {a.eventSeq}</span> : null}
            </span>
            <span className="text-body text-ink-700">{a.message}</span>
          </span>
        </li>
      ))}
    </ul>
  );
}
