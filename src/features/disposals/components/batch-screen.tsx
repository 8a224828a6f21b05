import { useQuery, useQueryClient } from '@tanstack/react-query';
import { useId, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import { SIGNATURE_MEANINGS } from '../../../../shared/schemas/auth';
import type { BatchCheckView, BatchKind, BatchView } from '../../../../shared/schemas/disposals';
import { Button } from '../../../components/ui/button';
import { Panel } from '../../../components/ui/detail-list';
import { PageHeader } from '../../../components/ui/page-header';
import { ApiError } from '../../../lib/api-client';
import { batchQueries, createBatch, signFor } from '../api/batches';
import { BatchLines } from './batch-lines';
import { ScanInput } from './scan-input';

const KIND_TEXT: Record<BatchKind, { title: string; action: string; doc: string }> = {
  disposal: { title: 'Dispose of items', action: 'Sign and dispose', doc: 'disposal certificate' },
  return: { title: 'Return items to the customer', action: 'Sign and hand over', doc: 'transfer form' },
};

function initialCodes(search: URLSearchParams): string[] {
  return (search.get('codes') ?? '').split(',').map((c) => c.trim()).filter(Boolean);
}

/**
 * The clerk's batch: scan the items, see at once which may go and why not, then sign with the
 * password and the meaning shown, and get the certificate (or transfer form) for the batch.
 */
export function BatchScreen() {
  const [search] = useSearchParams();
  const [kind, setKind] = useState<BatchKind>(search.get('kind') === 'return' ? 'return' : 'disposal');
  const [codes, setCodes] = useState<string[]>(() => initialCodes(search));
  const [orderNumber, setOrderNumber] = useState(search.get('order') ?? '');
  const [recipient, setRecipient] = useState('');
  const [password, setPassword] = useState('');
  const [busy, setBusy] = useState(false);
  const [error, setError] = useState<string | null>(null);
  const [refused, setRefused] = useState<BatchCheckView | null>(null);
  const [done, setDone] = useState<BatchView | null>(null);
  const queryClient = useQueryClient();
  const ids = { order: useId(), recipient: useId(), password: useId() };
  const check = useQuery(batchQueries.check(kind, codes, orderNumber.trim()));
  const lines = (refused ?? check.data)?.lines;
  const ready = codes.length > 0 && check.data?.ok === true && !check.isFetching;
  const meaning = kind === 'disposal' ? 'disposal' : 'return';

  const add = (code: string): string | null => {
    if (codes.includes(code)) return `${code} is already in this batch; each item counts once.`;
    setCodes((c) => [...c, code]);
    setRefused(null);
    setDone(null);
    return null;
  };

  const submit = async () => {
    setBusy(true);
    setError(null);
    try {
      const signature = await signFor(password, meaning);
      const batch = await createBatch({
        kind,
        codes,
        signatureToken: signature.signatureToken,
        ...(orderNumber.trim() ? { orderNumber: orderNumber.trim() } : {}),
        ...(kind === 'return' && recipient.trim() ? { recipient: recipient.trim() } : {}),
      });
      setDone(batch);
      setCodes([]);
      setPassword('');
      await queryClient.invalidateQueries({ queryKey: ['retention'] });
      await queryClient.invalidateQueries({ queryKey: batchQueries.all() });
    } catch (e) {
      if (e instanceof ApiError && e.code === 'batch_refused') setRefused(e.details as BatchCheckView);
      setError(e instanceof Error ? e.message : String(e));
    } finally {
      setBusy(false);
    }
  };

  return (
    <>
      <PageHeader title={KIND_TEXT[kind].title} subtitle="Scan each item. Anything that may not go is named with the reason, and nothing is recorded until every item may go." />
      <div className="grid gap-4 lg:grid-cols-[1fr_22rem]">
        <div className="flex flex-col gap-4">
          <fieldset className="flex flex-wrap gap-2" aria-label="Kind of batch">
            {(['disposal', 'return'] as const).map((k) => (
              <label key={k} className={`flex h-12 cursor-pointer items-center gap-2 rounded-md px-4 ring-1 ${kind === k ? 'bg-ink-900 text-white ring-ink-900' : 'bg-white ring-ink-300'}`}>
                <input type="radio" name="kind" value={k} checked={kind === k} onChange={() => { setKind(k); setRefused(null); }} className="sr-only" />
                {k === 'disposal' ? 'Disposal' : 'Return to customer'}
              </label>
            ))}
          </fieldset>
          <ScanInput label="Scan an item" onScan={add} />
          <BatchLines
            codes={codes}
            lines={lines}
            onRemove={(i) => {
              setCodes((c) => c.filter((_, n) => n !== i));
              setRefused(null);
            }}
          />
          {done ? (
            <div role="status" className="rounded-card bg-good-100 p-4 text-good-700 ring-1 ring-good-500">
              <p className="font-semibold">
                <span aria-hidden>◆ </span>
                Batch {done.number}: {done.items.length} item{done.items.length === 1 ? '' : 's'} {done.kind === 'disposal' ? 'disposed of' : 'returned'}, signed by {done.signer.name}.
              </p>
              <a className="mt-2 inline-block font-semibold underline" href={done.documentUrl} target="_blank" rel="noreferrer">
                Open the {KIND_TEXT[done.kind].doc} (PDF)
              </a>
            </div>
          ) : null}
        </div>
        <Panel title="Sign">
          <form
            className="flex flex-col gap-3"
            onSubmit={(e) => {
              e.preventDefault();
              void submit();
            }}
          >
            <div className="flex flex-col gap-1">
              <label htmlFor={ids.order} className="text-body font-semibold">Only items of order (optional)</label>
              <input id={ids.order} value={orderNumber} onChange={(e) => setOrderNumber(e.target.value)} className="h-10 rounded-md border border-ink-300 px-3" />
            </div>
            {kind === 'return' ? (
              <div className="flex flex-col gap-1">
                <label htmlFor={ids.recipient} className="text-body font-semibold">Received for the customer by</label>
                <input id={ids.recipient} value={recipient} onChange={(e) => setRecipient(e.target.value)} className="h-10 rounded-md border border-ink-300 px-3" />
              </div>
            ) : null}
            <p className="rounded-md bg-ink-50 p-3 text-caption text-ink-700">
              <strong>Meaning of your signature ({meaning}):</strong> {SIGNATURE_MEANINGS[meaning]}
            </p>
            <div className="flex flex-col gap-1">
              <label htmlFor={ids.password} className="text-body font-semibold">Your password</label>
              <input
                id={ids.password}
                type="password"
                autoComplete="current-password"
                value={password}
                onChange={(e) => setPassword(e.target.value)}
                className="h-12 rounded-md border border-ink-300 px-3"
              />
            </div>
            {error ? (
              <p role="alert" className="text-caption font-semibold text-stop-700">
                <span aria-hidden>▲ </span>
                {error}
              </p>
            ) : null}
            <Button type="submit" variant={kind === 'disposal' ? 'danger' : 'primary'} size="lg" disabled={!ready || password === ''} busy={busy}>
              {KIND_TEXT[kind].action} ({codes.length})
            </Button>
            {!ready && codes.length > 0 && check.data && !check.data.ok ? (
              <p className="text-caption text-stop-700">Take out or resolve the items marked above first.</p>
            ) : null}
          </form>
        </Panel>
      </div>
    </>
  );
}
