import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { Page } from '../../../shared/schemas/intake-common';
import type { OrderView } from '../../../shared/schemas/orders';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { api } from '../../lib/api-client';

/** /results: orders, newest first, each leading to its results and report. */
export function ResultsRoute() {
  const { data, error } = useQuery({ queryKey: ['orders', 'list', { pageSize: 100 }], queryFn: () => api<Page<OrderView>>('/orders?pageSize=100') });
  return (
    <div>
      <PageHeader title="Results" subtitle="Choose an order to see its specimens’ results and verdicts, and to issue its report." />
      {error ? <p className="text-stop-700" role="alert">⚠ {error.message}</p> : null}
      <ul className="divide-y divide-ink-100 rounded-lg border border-ink-200 bg-white">
        {data?.items.map((o) => (
          <li key={o.id} className="flex flex-wrap items-center gap-3 px-4 py-3 text-body">
            <Link className="font-mono font-semibold underline" to={paths.resultsOrder.href(o.id)}>
              {o.number}
            </Link>
            <span>{o.customerName}</span>
            <span className="text-ink-500">{o.materialSpec}</span>
            <span className="ml-auto text-caption text-ink-500">{o.specimenCount} specimens · {o.status}</span>
          </li>
        ))}
      </ul>
    </div>
  );
}
