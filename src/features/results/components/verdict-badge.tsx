import type { Verdict } from '../../../../shared/domain/tensile/specifications';

const LOOK: Record<Verdict, { word: string; tone: string; shape: 'check' | 'cross' | 'query' }> = {
  conforms: { word: 'Conforms', tone: 'bg-good-100 text-good-700 ring-good-500', shape: 'check' },
  'does-not-conform': { word: 'Does not conform', tone: 'bg-stop-100 text-stop-700 ring-stop-500', shape: 'cross' },
  'cannot-judge': { word: 'Cannot judge', tone: 'bg-warn-100 text-warn-700 ring-warn-500', shape: 'query' },
};

function Mark({ shape }: { shape: 'check' | 'cross' | 'query' }) {
  const common = { width: 12, height: 12, viewBox: '0 0 12 12', 'aria-hidden': true, fill: 'none', stroke: 'currentColor', strokeWidth: 2 } as const;
  if (shape === 'check') return <svg {...common}><path d="M2 6.5 5 9.5 10 2.5" /></svg>;
  if (shape === 'cross') return <svg {...common}><path d="M2.5 2.5 9.5 9.5M9.5 2.5 2.5 9.5" /></svg>;
  return <svg {...common}><path d="M4 4.2a2 2 0 1 1 2.6 1.9c-.5.2-.6.6-.6 1.1v.6M6 10v.2" /></svg>;
}

/** A verdict by word and shape (tick, cross, question mark), never by colour alone. */
export function VerdictBadge({ verdict }: { verdict: Verdict | null }) {
  if (verdict === null) return <span className="text-caption text-ink-500">Not judged</span>;
  const look = LOOK[verdict];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-caption font-semibold ring-1 ring-inset ${look.tone}`} data-verdict={verdict}>
      <Mark shape={look.shape} />
      {look.word}
    </span>
  );
}
