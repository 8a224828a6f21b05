import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { ReactNode } from 'react';
import type { OrderResultsView } from '../../../../shared/schemas/reports';
import { PageHeader } from '../../../components/ui/page-header';
import { StateBadge } from '../../../components/ui/state-badge';
import { api } from '../../../lib/api-client';
import { resultsQueries } from '../api/queries';
import { VerdictBadge } from './verdict-badge';

/** An order's specimens with their results and verdicts, its specification, and (as `children`) the report panel. */
export function OrderResultsScreen({ orderId, specimenHref, specKeys, children }: { orderId: number; specimenHref: (code: string) => string; specKeys: readonly { key: string; name: string }[]; children?: (view: OrderResultsView) => ReactNode }) {
  const client = useQueryClient();
  const { data: view, error, isPending } = useQuery(resultsQueries.order(orderId));
  const choose = useMutation({
    mutationFn: (specKey: string) => api<OrderResultsView>(`/reports/orders/${orderId}/specification`, { method: 'PUT', json: { specKey } }),
    onSuccess: (next) => client.setQueryData(resultsQueries.order(orderId).queryKey, next),
  });
  if (isPending) return <p className="text-body text-ink-500">Loading the order’s results…</p>;
  if (error || !view) return <p className="text-body text-stop-700" role="alert">⚠ {error?.message ?? 'The results could not be loaded.'}</p>;
  const rm = (s: OrderResultsView['specimens'][number], key: 'tensileStrength' | 'offsetYieldStrength' | 'elongation') => {
    const r = s.properties?.[key];
    return r?.status === 'determined' ? `${r.value} ${r.unit}` : '—';
  };
  return (
    <div className="space-y-5">
      <PageHeader
        title={`Results of order ${view.order.number}`}
        subtitle={`${view.order.customerName} · PO ${view.order.poReference} · ${view.order.materialSpec} · ${view.order.testStandard}`}
      />
      <section className="rounded-lg border border-ink-200 bg-white p-4 text-body">
        <div className="flex flex-wrap items-center gap-3">
          <span className="font-semibold">Specification:</span>
          {view.specification.status === 'found' ? <span>{view.specification.name}</span> : <span className="text-warn-700">⚠ {view.specification.reason}</span>}
          <span className="ml-auto flex items-center gap-2">
            Order verdict <VerdictBadge verdict={view.verdict} />
          </span>
        </div>
        {view.canIssue || view.specification.status === 'none' ? (
          <label className="mt-3 block text-caption font-semibold text-ink-700">
            Judge against
            <select
              className="ml-2 h-10 rounded-md border border-ink-300 px-2 text-body"
              value={view.specification.status === 'found' ? view.specification.key : ''}
              onChange={(e) => e.target.value && choose.mutate(e.target.value)}
            >
              <option value="">Choose a specification</option>
              {specKeys.map((s) => (
                <option key={s.key} value={s.key}>
                  {s.name}
                </option>
              ))}
            </select>
          </label>
        ) : null}
      </section>
      <div className="overflow-x-auto rounded-lg border border-ink-200 bg-white">
        <table className="w-full text-body">
          <thead className="bg-ink-50 text-left text-caption text-ink-600">
            <tr>
              <th className="px-3 py-2">Specimen</th>
              <th className="px-3 py-2">Heat</th>
              <th className="px-3 py-2">State</th>
              <th className="px-3 py-2">Rm</th>
              <th className="px-3 py-2">Rp0.2</th>
              <th className="px-3 py-2">A</th>
              <th className="px-3 py-2">Verdict</th>
            </tr>
          </thead>
          <tbody>
            {view.specimens.map((s) => (
              <tr key={s.code} className="border-t border-ink-100">
                <td className="px-3 py-2 font-mono">
                  <Link className="underline" to={specimenHref(s.code)}>
                    {s.code}
                  </Link>
                </td>
                <td className="px-3 py-2 font-mono">{s.heatNumber}</td>
                <td className="px-3 py-2"><StateBadge state={s.state} /></td>
                <td className="px-3 py-2 font-mono">{rm(s, 'tensileStrength')}</td>
                <td className="px-3 py-2 font-mono">{rm(s, 'offsetYieldStrength')}</td>
                <td className="px-3 py-2 font-mono">{rm(s, 'elongation')}</td>
                <td className="px-3 py-2">{s.excluded ? <span className="text-caption text-ink-500">Left out: {s.excluded}</span> : s.resultsId === null ? <span className="text-caption text-ink-500">No results</span> : <VerdictBadge verdict={s.verdict?.verdict ?? null} />}</td>
              </tr>
            ))}
          </tbody>
        </table>
      </div>
      {children?.(view)}
    </div>
  );
}
