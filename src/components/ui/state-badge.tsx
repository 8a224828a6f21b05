/**
 * An item's state shown by word, shape and colour together, so that no one needs colour to read
 * it: a ring for work still moving, a square for items at rest in storage, a triangle for
 * anything that needs attention, and a filled diamond for a finished life.
 */
type Shape = 'ring' | 'dot' | 'square' | 'triangle' | 'diamond';

interface Look {
  shape: Shape;
  tone: string;
}

const LOOKS: Record<string, Look> = {
  registered: { shape: 'ring', tone: 'bg-ink-100 text-ink-800 ring-ink-300' },
  cut: { shape: 'ring', tone: 'bg-ink-100 text-ink-800 ring-ink-300' },
  conditioning: { shape: 'ring', tone: 'bg-straw-100 text-straw-700 ring-straw-500' },
  conditioned: { shape: 'dot', tone: 'bg-straw-100 text-straw-700 ring-straw-500' },
  measured: { shape: 'dot', tone: 'bg-temper-100 text-temper-800 ring-temper-300' },
  tested: { shape: 'dot', tone: 'bg-temper-100 text-temper-800 ring-temper-400' },
  broken: { shape: 'dot', tone: 'bg-temper-100 text-temper-800 ring-temper-400' },
  binned: { shape: 'square', tone: 'bg-ink-100 text-ink-800 ring-ink-400' },
  retained: { shape: 'square', tone: 'bg-good-100 text-good-700 ring-good-500' },
  active: { shape: 'square', tone: 'bg-good-100 text-good-700 ring-good-500' },
  held: { shape: 'triangle', tone: 'bg-warn-100 text-warn-700 ring-warn-500' },
  rejected: { shape: 'triangle', tone: 'bg-stop-100 text-stop-700 ring-stop-500' },
  in_transit: { shape: 'ring', tone: 'bg-ink-100 text-ink-800 ring-ink-400' },
  returned: { shape: 'diamond', tone: 'bg-ink-200 text-ink-800 ring-ink-500' },
  disposed: { shape: 'diamond', tone: 'bg-ink-200 text-ink-800 ring-ink-500' },
};

function ShapeIcon({ shape }: { shape: Shape }) {
  const common = { width: 10, height: 10, viewBox: '0 0 10 10', 'aria-hidden': true } as const;
  switch (shape) {
    case 'ring':
      return <svg {...common}><circle cx="5" cy="5" r="3.6" fill="none" stroke="currentColor" strokeWidth="1.8" /></svg>;
    case 'dot':
      return <svg {...common}><circle cx="5" cy="5" r="4" fill="currentColor" /></svg>;
    case 'square':
      return <svg {...common}><rect x="1" y="1" width="8" height="8" fill="currentColor" /></svg>;
    case 'triangle':
      return <svg {...common}><path d="M5 0.8 9.6 9.2H0.4Z" fill="currentColor" /></svg>;
    case 'diamond':
      return <svg {...common}><path d="M5 0 10 5 5 10 0 5Z" fill="currentColor" /></svg>;
  }
}

/** Human words for the state names the ledger uses. */
export function stateLabel(state: string): string {
  return state.replace(/_/g, ' ');
}

/** A small pill with the state's shape and name. */
export function StateBadge({ state }: { state: string }) {
  const look = LOOKS[state] ?? { shape: 'ring' as const, tone: 'bg-ink-100 text-ink-800 ring-ink-300' };
  return (
    <span
      className={`inline-flex items-center gap-1.5 rounded-full px-2 py-0.5 text-caption font-semibold ring-1 ring-inset ${look.tone}`}
      data-state={state}
      data-shape={look.shape}
    >
      <ShapeIcon shape={look.shape} />
      {stateLabel(state)}
    </span>
  );
}
