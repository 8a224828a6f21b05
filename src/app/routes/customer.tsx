import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Button, ButtonLink } from '../../components/ui/button';
import { DetailList, Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { customerQueries } from '../../features/customers/api/queries';
import { CustomerForm } from '../../features/customers/components/customer-form';
import { queryClient } from '../../lib/query-client';

/** Loads the customer before the screen shows. */
export function loader({ params }: LoaderFunctionArgs) {
  return queryClient.ensureQueryData(customerQueries.detail(Number(params.id)));
}

/** One customer: contact, retention rule, and a way to their orders. */
export function CustomerRoute() {
  const id = Number(useParams().id);
  const { data: customer } = useSuspenseQuery(customerQueries.detail(id));
  const [editing, setEditing] = useState(false);
  return (
    <>
      <PageHeader
        title={customer.name}
        subtitle="Customer"
        actions={
          <>
            <ButtonLink to={`${paths.orders.path}?customerId=${customer.id}`}>Orders ({customer.orderCount})</ButtonLink>
            {customer.canWrite && !editing ? <Button onClick={() => setEditing(true)}>Change</Button> : null}
          </>
        }
      />
      <Panel>
        {editing ? (
          <CustomerForm customer={customer} onSaved={() => setEditing(false)} onCancel={() => setEditing(false)} />
        ) : (
          <DetailList
            items={[
              { label: 'Contact e-mail', value: customer.contactEmail },
              { label: 'Retention', value: customer.retentionDays === null ? 'Lab default' : `${customer.retentionDays} days` },
              { label: 'Orders', value: customer.orderCount },
            ]}
          />
        )}
      </Panel>
    </>
  );
}
