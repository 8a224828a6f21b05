import { useQuery } from '@tanstack/react-query';
import { useSearchParams } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { anomalyQueries, type AnomalyFilters } from '../../features/anomalies/api/queries';
import { AnomalyTable, Severity } from '../../features/anomalies/components/anomaly-table';

const SEVERITIES = ['critical', 'warning', 'info'] as const;

/** Anomalies across the lab, most serious first; filters and the page live in the URL. */
export function AnomaliesRoute() {
  const [params, setParams] = useSearchParams();
  const severityParam = params.get('severity');
  const filters: AnomalyFilters = {
    page: Math.max(1, Number(params.get('page')) || 1),
    ...(SEVERITIES.includes(severityParam as (typeof SEVERITIES)[number]) ? { severity: severityParam as (typeof SEVERITIES)[number] } : {}),
  };
  const list = useQuery(anomalyQueries.list(filters));
  const set = (next: Partial<Record<'page' | 'severity', string | null>>) => {
    const copy = new URLSearchParams(params);
    for (const [k, v] of Object.entries(next)) {
      if (v === null || v === undefined) copy.delete(k);
      else copy.set(k, v);
    }
    setParams(copy);
  };
  const data = list.data;
  const pages = data ? Math.max(1, Math.ceil(data.total / data.pageSize)) : 1;
  return (
    <>
      <PageHeader
        title="Anomalies"
        subtitle={data ? `${data.itemsChecked} items checked ${new Date(data.checkedAt).toLocaleString()}.` : 'Checking every chain in the lab …'}
      />
      <div className="mb-4 flex flex-wrap gap-2" role="group" aria-label="Severity">
        <Button variant={filters.severity ? 'secondary' : 'primary'} size="sm" onClick={() => set({ severity: null, page: null })}>
          All
        </Button>
        {SEVERITIES.map((s) => (
          <Button key={s} variant={filters.severity === s ? 'primary' : 'secondary'} size="sm" onClick={() => set({ severity: s, page: null })} aria-pressed={filters.severity === s}>
            <Severity severity={s} />
            <span>{data ? data.counts[s] : '…'}</span>
          </Button>
        ))}
      </div>
      <Panel>
        {list.isError ? <p className="text-body text-stop-700">▲ {list.error.message}</p> : null}
        {data ? <AnomalyTable page={data} /> : list.isPending ? <p className="text-body text-ink-500">Reading the ledger …</p> : null}
        {data && pages > 1 ? (
          <div className="mt-4 flex items-center justify-between gap-2">
            <Button variant="secondary" size="sm" disabled={filters.page <= 1} onClick={() => set({ page: String(filters.page - 1) })}>
              ← Previous
            </Button>
            <span className="text-caption text-ink-600">
              Page {filters.page} of {pages} · {data.total} anomalies
            </span>
            <Button variant="secondary" size="sm" disabled={filters.page >= pages} onClick={() => set({ page: String(filters.page + 1) })}>
              Next →
            </Button>
          </div>
        ) : null}
      </Panel>
    </>
  );
}
