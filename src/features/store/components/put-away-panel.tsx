import { useQueryClient } from '@tanstack/react-query';
import { useState } from 'react';
import type { PutAwayOutcome } from '../../../../shared/schemas/retention';
import { Button } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/detail-list';
import { ScanInput } from '../../disposals/components/scan-input';
import { putAway, storeQueries } from '../api/store';

/**
 * Putting away at the store: scan the bag, box or shelf first, then what goes into it (halves
 * from a bin, bags into a box, boxes onto a shelf), then record. Each scan is one ledger event.
 */
export function PutAwayPanel() {
  const [into, setInto] = useState<string | null>(null);
  const [codes, setCodes] = useState<string[]>([]);
  const [outcomes, setOutcomes] = useState<PutAwayOutcome[]>([]);
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const queryClient = useQueryClient();
  const record = async () => {
    if (!into) return;
    setBusy(true);
    setError(null);
    try {
      const res = await putAway(into, codes);
      setOutcomes(res.outcomes);
      setCodes([]);
      await queryClient.invalidateQueries({ queryKey: storeQueries.all() });
    } catch (e) {
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  };
  return (
    <Panel title="Put away">
      <div className="flex flex-col gap-3">
        {into === null ? (
          <ScanInput label="First scan the bag, box or shelf" onScan={(code) => (code.startsWith('C') ? (setInto(code), null) : `${code} is not a container; scan the bag, box or shelf first.`)} />
        ) : (
          <>
            <p className="text-body">
              Into <span className="font-mono font-semibold">{into}</span>{' '}
              <Button variant="ghost" size="sm" onClick={() => { setInto(null); setCodes([]); }}>
                Change
              </Button>
            </p>
            <ScanInput label="Scan what goes in" onScan={(code) => (codes.includes(code) ? `${code} is already on the list.` : (setCodes((c) => [...c, code]), null))} />
            <ul className="flex flex-wrap gap-2" aria-label="To put away">
              {codes.map((c) => (
                <li key={c} className="rounded-md bg-ink-50 px-2 py-1 font-mono text-caption">{c}</li>
              ))}
            </ul>
            <Button variant="primary" size="lg" disabled={codes.length === 0} busy={busy} onClick={() => void record()}>
              Record {codes.length} into {into}
            </Button>
          </>
        )}
        {error ? <p role="alert" className="text-caption font-semibold text-stop-700">▲ {error}</p> : null}
        {outcomes.length > 0 ? (
          <ul className="flex flex-col gap-1 text-caption" aria-label="Put-away results">
            {outcomes.map((o) => (
              <li key={o.code} className={o.ok ? 'text-good-700' : 'font-semibold text-stop-700'}>
                <span aria-hidden>{o.ok ? '◆ ' : '▲ '}</span>
                {o.message}
              </li>
            ))}
          </ul>
        ) : null}
      </div>
    </Panel>
  );
}
