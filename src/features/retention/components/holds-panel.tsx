import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { SIGNATURE_MEANINGS } from '../../../../shared/schemas/auth';
import { HOLD_SCOPES, type HoldScope, type HoldView } from '../../../../shared/schemas/holds';
import { Button } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/detail-list';
import { api } from '../../../lib/api-client';
import { signFor } from '../../disposals/api/batches';
import { retentionQueries } from '../api/queries';

const SCOPE_TEXT: Record<HoldScope, { label: string; placeholder: string }> = {
  order: { label: 'Order', placeholder: 'Order number' },
  heat: { label: 'Heat', placeholder: 'Heat number' },
  item: { label: 'Item', placeholder: 'Specimen or half code' },
};

/** Placing a hold: what it covers and why. */
export function PlaceHoldForm() {
  const [scope, setScope] = useState<HoldScope>('order');
  const [ref, setRef] = useState('');
  const [reason, setReason] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const queryClient = useQueryClient();
  const ids = { scope: useId(), ref: useId(), reason: useId() };
  return (
    <Panel title="Place a hold">
      <form
        className="flex flex-col gap-3"
        onSubmit={(e) => {
          e.preventDefault();
          setBusy(true);
          setError(null);
          api<HoldView>('/holds', { method: 'POST', json: { scope, ref, reason } })
            .then(async () => {
              setRef('');
              setReason('');
              await queryClient.invalidateQueries({ queryKey: retentionQueries.all() });
            })
            .catch((err: unknown) => setError(err instanceof Error ? err.message : String(err)))
            .finally(() => setBusy(false));
        }}
      >
        <label htmlFor={ids.scope} className="text-body font-semibold">On</label>
        <select id={ids.scope} value={scope} onChange={(e) => setScope(e.target.value as HoldScope)} className="h-10 rounded-md border border-ink-300 px-2">
          {HOLD_SCOPES.map((s) => (
            <option key={s} value={s}>{SCOPE_TEXT[s].label}</option>
          ))}
        </select>
        <label htmlFor={ids.ref} className="text-body font-semibold">{SCOPE_TEXT[scope].placeholder}</label>
        <input id={ids.ref} value={ref} onChange={(e) => setRef(e.target.value)} className="h-10 rounded-md border border-ink-300 px-3 font-mono" />
        <label htmlFor={ids.reason} className="text-body font-semibold">Reason</label>
        <textarea id={ids.reason} value={reason} onChange={(e) => setReason(e.target.value)} rows={2} className="rounded-md border border-ink-300 px-3 py-2" />
        {error ? <p role="alert" className="text-caption font-semibold text-stop-700">▲ {error}</p> : null}
        <Button type="submit" variant="primary" busy={busy} disabled={!ref.trim() || !reason.trim()}>
          Place hold
        </Button>
      </form>
    </Panel>
  );
}

function ReleaseForm({ hold }: { hold: HoldView }) {
  const [open, setOpen] = useState(false);
  const [reason, setReason] = useState('');
  const [password, setPassword] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const queryClient = useQueryClient();
  const ids = { reason: useId(), password: useId() };
  if (!open) {
    return (
      <Button variant="secondary" size="sm" onClick={() => setOpen(true)}>
        Release…
      </Button>
    );
  }
  return (
    <form
      className="mt-2 flex w-full flex-col gap-2 rounded-md bg-ink-50 p-3"
      onSubmit={(e) => {
        e.preventDefault();
        setBusy(true);
        setError(null);
        signFor(password, 'hold-release')
          .then((sig) => api(`/holds/${hold.id}/release`, { method: 'POST', json: { reason, signatureToken: sig.signatureToken } }))
          .then(() => queryClient.invalidateQueries({ queryKey: retentionQueries.all() }))
          .catch((err: unknown) => setError(err instanceof Error ? err.message : String(err)))
          .finally(() => setBusy(false));
      }}
    >
      <p className="text-caption"><strong>Meaning of your signature:</strong> {SIGNATURE_MEANINGS['hold-release']}</p>
      <label htmlFor={ids.reason} className="text-caption font-semibold">Why the hold can end</label>
      <input id={ids.reason} value={reason} onChange={(e) => setReason(e.target.value)} className="h-10 rounded-md border border-ink-300 px-3" />
      <label htmlFor={ids.password} className="text-caption font-semibold">Your password</label>
      <input id={ids.password} type="password" autoComplete="current-password" value={password} onChange={(e) => setPassword(e.target.value)} className="h-10 rounded-md border border-ink-300 px-3" />
      {error ? <p role="alert" className="text-caption font-semibold text-stop-700">▲ {error}</p> : null}
      <div className="flex gap-2">
        <Button type="submit" variant="primary" size="sm" busy={busy} disabled={!reason.trim() || !password}>Sign and release</Button>
        <Button variant="ghost" size="sm" onClick={() => setOpen(false)}>Cancel</Button>
      </div>
    </form>
  );
}

/** The holds, in force first; each in force can be released with a signature. */
export function HoldsList({ canWrite }: { canWrite: boolean }) {
  const [showAll, setShowAll] = useState(false);
  const holds = useQuery(retentionQueries.holds(showAll ? null : true));
  return (
    <Panel
      title={showAll ? 'All holds' : 'Holds in force'}
      actions={<Button variant="ghost" size="sm" onClick={() => setShowAll((v) => !v)}>{showAll ? 'Only those in force' : 'Show released too'}</Button>}
    >
      {holds.data && holds.data.items.length === 0 ? <p className="text-ink-500">No holds.</p> : null}
      <ul className="flex flex-col divide-y divide-ink-100" aria-label="Holds">
        {(holds.data?.items ?? []).map((h) => (
          <li key={h.id} className="flex flex-wrap items-start justify-between gap-2 py-3" data-hold={h.id}>
            <span className="min-w-0 flex-1">
              <span className="block font-semibold">
                <span aria-hidden>{h.releasedAt ? '○ ' : '▲ '}</span>
                {SCOPE_TEXT[h.scope].label} <span className="font-mono">{h.ref}</span> · {h.items} retained item{h.items === 1 ? '' : 's'}
              </span>
              <span className="block text-caption text-ink-600">{h.reason} — placed by {h.placedBy.name}, {new Date(h.placedAt).toLocaleString()}</span>
              {h.releasedAt ? (
                <span className="block text-caption text-ink-600">Released by {h.releasedBy?.name}, {new Date(h.releasedAt).toLocaleString()}: {h.releaseReason}</span>
              ) : null}
            </span>
            {canWrite && !h.releasedAt ? <ReleaseForm hold={h} /> : null}
          </li>
        ))}
      </ul>
    </Panel>
  );
}
