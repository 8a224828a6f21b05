import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { DataTable, useServerList } from '../../components/ui/data-table';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { customerQueries } from '../../features/customers/api/queries';
import { customerColumns } from '../../features/customers/components/columns';
import { CustomerForm } from '../../features/customers/components/customer-form';

/** Customers: who orders the tests. */
export function CustomersRoute() {
  const list = useServerList('name', [], customerQueries.list);
  const [adding, setAdding] = useState(false);
  const navigate = useNavigate();
  return (
    <>
      <PageHeader
        title="Customers"
        subtitle="Who orders the tests, and how long their halves are kept."
        actions={list.query.data?.canWrite && !adding ? <Button onClick={() => setAdding(true)}>New customer</Button> : null}
      />
      {adding ? (
        <Panel title="New customer" className="mb-5">
          <CustomerForm onSaved={(c) => navigate(paths.customer.href(c.id))} onCancel={() => setAdding(false)} />
        </Panel>
      ) : null}
      <DataTable
        label="Customers"
        columns={customerColumns}
        list={list}
        searchPlaceholder="Search by name or e-mail"
        rowKey={(c) => c.id}
      />
    </>
  );
}
