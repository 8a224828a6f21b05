import { useQuery } from '@tanstack/react-query';
import { ButtonLink } from '../../components/ui/button';
import { DataTable, FilterSelect, useServerList } from '../../components/ui/data-table';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { customerQueries } from '../../features/customers/api/queries';
import { orderQueries } from '../../features/orders/api/queries';
import { ORDER_STATUS_OPTIONS, orderColumns } from '../../features/orders/components/columns';

/** Orders: what customers asked the lab to test. */
export function OrdersRoute() {
  const list = useServerList('-createdAt', ['status', 'customerId', 'heatId'], orderQueries.list);
  const { params, setParams } = list;
  const customers = useQuery(customerQueries.list({ sort: 'name', page: 1, pageSize: 100 }));
  return (
    <>
      <PageHeader
        title="Orders"
        subtitle="What each customer asked for, and where it stands."
        actions={list.query.data?.canWrite ? <ButtonLink to={paths.orderNew.path} variant="primary">New order</ButtonLink> : null}
      />
      <DataTable
        label="Orders"
        columns={orderColumns}
        list={list}
        searchPlaceholder="Search by number, PO, specification or customer"
        rowKey={(o) => o.id}
        filters={
          <>
            <FilterSelect label="Status" value={params.filters.status} options={ORDER_STATUS_OPTIONS} onChange={(status) => setParams({ filters: { status } })} />
            <FilterSelect
              label="Customer"
              value={params.filters.customerId}
              options={(customers.data?.items ?? []).map((c) => ({ value: String(c.id), label: c.name }))}
              onChange={(customerId) => setParams({ filters: { customerId } })}
            />
          </>
        }
      />
    </>
  );
}
