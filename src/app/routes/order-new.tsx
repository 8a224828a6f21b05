import { useQuery } from '@tanstack/react-query';
import { Link, useNavigate } from 'react-router-dom';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { customerQueries } from '../../features/customers/api/queries';
import { OrderForm } from '../../features/orders/components/order-form';

/** A new order; its heats and cut list follow on the order's own page. */
export function OrderNewRoute() {
  const customers = useQuery(customerQueries.list({ sort: 'name', page: 1, pageSize: 100 }));
  const navigate = useNavigate();
  return (
    <>
      <PageHeader title="New order" subtitle="Heats and the cut list are added on the order’s page once it is saved." />
      <Panel>
        {customers.data && customers.data.total === 0 ? (
          <p className="mb-4 text-body text-ink-600">
            No customers yet: <Link to={paths.customers.path} className="font-semibold text-temper-700 underline">add one first</Link>.
          </p>
        ) : null}
        <OrderForm
          customers={(customers.data?.items ?? []).map((c) => ({ value: c.id, label: c.name }))}
          onSaved={(o) => navigate(paths.order.href(o.id))}
          onCancel={() => navigate(paths.orders.path)}
        />
      </Panel>
    </>
  );
}
