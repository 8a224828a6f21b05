import { useQuery } from '@tanstack/react-query';
import { Panel } from '../../../components/ui/detail-list';
import { batchQueries } from '../api/batches';

/** The most recent signed batches, each with its document. */
export function RecentBatches() {
  const list = useQuery(batchQueries.list({ page: 1, pageSize: 10 }));
  return (
    <Panel title="Recent batches" className="mt-6">
      {list.data && list.data.items.length === 0 ? <p className="text-ink-500">No batch has been signed yet.</p> : null}
      <ul className="flex flex-col divide-y divide-ink-100">
        {(list.data?.items ?? []).map((b) => (
          <li key={b.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
            <span>
              <span className="font-mono font-semibold">{b.number}</span> · {b.kind === 'disposal' ? 'disposal' : 'return'} of {b.itemCount} item{b.itemCount === 1 ? '' : 's'}
              {b.order ? ` · order ${b.order}` : ''} · signed by {b.signer.name}, {new Date(b.signedAt).toLocaleString()}
            </span>
            <a className="font-semibold underline" href={b.documentUrl} target="_blank" rel="noreferrer">
              {b.kind === 'disposal' ? 'Certificate' : 'Transfer form'} (PDF)
            </a>
          </li>
        ))}
      </ul>
    </Panel>
  );
}
