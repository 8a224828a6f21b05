import { useQuery } from '@tanstack/react-query';
import { useEffect, useId, useState } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { parseCode } from '../../../../shared/domain/codes';
import type { SearchHit } from '../../../../shared/schemas/trace';
import { StateBadge } from '../../../components/ui/state-badge';
import { paths } from '../../../config/paths';
import { searchQueries } from '../api/queries';

const MATCHED: Record<SearchHit['matched'], string> = {
  code: 'code',
  sample_code: 'sample',
  heat_number: 'heat number',
  order_number: 'order number',
  po_reference: 'purchase order',
};

/** Where a hit leads: items to their trace, the rest to their own page. */
function hrefOf(hit: SearchHit): string {
  if (hit.code) return paths.trace.href(hit.code);
  if (hit.kind === 'order') return paths.order.href(hit.id);
  if (hit.kind === 'heat') return paths.heat.href(hit.id);
  return paths.sample.href(hit.id);
}

function useDebounced(value: string, ms: number): string {
  const [debounced, setDebounced] = useState(value);
  useEffect(() => {
    const timer = setTimeout(() => setDebounced(value), ms);
    return () => clearTimeout(timer);
  }, [value, ms]);
  return debounced;
}

/**
 * One box for a scanned or typed code, a heat number, an order number or a purchase-order
 * reference. A text shaped like a code gets its check character judged as it is typed; Enter on
 * a good code (or a keyboard-wedge scanner's Enter) opens its trace; anything else lists matches.
 */
export function SearchBox({ autoFocus = false }: { autoFocus?: boolean }) {
  const [text, setText] = useState('');
  const id = useId();
  const navigate = useNavigate();
  const q = useDebounced(text.trim(), 200);
  const results = useQuery(searchQueries.results(q));
  const parsed = text.trim().length >= 3 ? parseCode(text) : null;
  const codeLike = /^[SCU]\d/i.test(text.trim());
  const good = parsed?.ok && parsed.kind !== 'badge' ? parsed : null;
  // A wrong check character is worth saying at once; a half-typed code is not.
  const problem = codeLike && parsed && !parsed.ok && (parsed.reason === 'check' || text.replace(/[\s-]/g, '').length >= 8) ? parsed.message : null;
  const hits = q.length >= 2 ? (results.data?.hits ?? []) : [];

  return (
    <div className="flex flex-col gap-2">
      <form
        role="search"
        onSubmit={(e) => {
          e.preventDefault();
          if (good) navigate(paths.trace.href(good.code));
          else if (hits.length === 1 && hits[0]) navigate(hrefOf(hits[0]));
        }}
        className="flex flex-col gap-1"
      >
        <label htmlFor={id} className="text-body font-semibold text-ink-800">
          Scan or type a code, heat, order or PO
        </label>
        <div className="flex gap-2">
          <input
            id={id}
            value={text}
            onChange={(e) => setText(e.target.value)}
            autoFocus={autoFocus}
            autoComplete="off"
            autoCapitalize="characters"
            spellCheck={false}
            placeholder="S26-00157-W, H24-31877, LM-26-0101 …"
            aria-invalid={problem ? true : undefined}
            aria-describedby={`${id}-status`}
            data-testid="search-input"
            className={`h-12 min-w-0 flex-1 rounded-md border px-3 font-mono text-lead tracking-wide ${problem ? 'border-stop-500 ring-1 ring-stop-500' : good ? 'border-good-500' : 'border-ink-300'}`}
          />
          <button type="submit" className="h-12 rounded-md bg-ink-900 px-4 font-semibold text-white disabled:bg-ink-400" disabled={!good && hits.length !== 1}>
            Trace
          </button>
        </div>
        <p id={`${id}-status`} aria-live="polite" data-testid="search-status" className={`min-h-5 text-caption font-semibold ${problem ? 'text-stop-700' : 'text-good-700'}`}>
          {problem ? (
            <>
              <span aria-hidden>▲ </span>
              {problem}
            </>
          ) : good ? (
            <>
              <span aria-hidden>● </span>Check character good: {good.code}. Press Enter to trace it.
            </>
          ) : null}
        </p>
      </form>
      {q.length >= 2 ? (
        <div className="rounded-card bg-white ring-1 ring-ink-100">
          {results.isError ? <p className="p-3 text-body text-stop-700">{results.error.message}</p> : null}
          {results.isSuccess && hits.length === 0 ? <p className="p-3 text-body text-ink-500">Nothing matches “{q}”.</p> : null}
          {hits.length > 0 ? (
            <ul className="divide-y divide-ink-100" data-testid="search-results">
              {hits.map((hit) => (
                <li key={`${hit.kind}-${hit.id}-${hit.matched}`}>
                  <Link to={hrefOf(hit)} className="flex flex-wrap items-center gap-x-3 gap-y-1 px-3 py-2.5 hover:bg-ink-50">
                    <span className="w-20 text-caption font-semibold uppercase tracking-wide text-ink-500">{hit.kind}</span>
                    <span className="font-mono font-semibold text-ink-900">{hit.label}</span>
                    {hit.state ? <StateBadge state={hit.state} /> : null}
                    <span className="text-caption text-ink-500">
                      {MATCHED[hit.matched]} · {hit.detail}
                    </span>
                  </Link>
                </li>
              ))}
            </ul>
          ) : null}
        </div>
      ) : null}
    </div>
  );
}
