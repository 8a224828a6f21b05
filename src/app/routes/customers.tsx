import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { DataTable, listQueryOf, useListParams } from '../../components/ui/data-table';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { customerQueries } from '../../features/customers/api/queries';
import { customerColumns } from '../../features/customers/components/columns';
import { CustomerForm } from '../../features/customers/components/customer-form';

/** Customers: who orders the tests. */
export function CustomersRoute() {
  const [params, setParams] = useListParams('name');
  const list = useQuery(customerQueries.list(listQueryOf(params)));
  const [adding, setAdding] = useState(false);
  const navigate = useNavigate();
  return (
    <>
      <PageHeader
        title="Customers"
        subtitle="Who orders the tests, and how long their halves are kept."
        actions={list.data?.canWrite && !adding ? <Button onClick={() => setAdding(true)}>New customer</Button> : null}
      />
      {adding ? (
        <Panel title="New customer" className="mb-5">
          <CustomerForm onSaved={(c) => navigate(paths.customer.href(c.id))} onCancel={() => setAdding(false)} />
        </Panel>
      ) : null}
      <DataTable
        label="Customers"
        columns={customerColumns}
        data={list.data}
        isFetching={list.isFetching}
        isStale={list.isPlaceholderData}
        error={list.error}
        params={params}
        onParams={setParams}
        searchPlaceholder="Search by name or e-mail"
        rowKey={(c) => c.id}
      />
    </>
  );
}
