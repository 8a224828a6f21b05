import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { CustomerView } from '../../../../shared/schemas/customers';
import { paths } from '../../../config/paths';

/** Columns of the customer list; sortable ones carry the server's sort key as id. */
export const customerColumns: ColumnDef<CustomerView>[] = [
  {
    id: 'name',
    header: 'Name',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.customer.href(row.original.id)} className="font-semibold text-temper-700 underline-offset-2 hover:underline">
        {row.original.name}
      </Link>
    ),
  },
  { id: 'contactEmail', header: 'Contact', cell: ({ row }) => row.original.contactEmail ?? '—' },
  { id: 'retentionDays', header: 'Retention', cell: ({ row }) => (row.original.retentionDays === null ? 'Lab default' : `${row.original.retentionDays} days`) },
  { id: 'orders', header: 'Orders', enableSorting: true, cell: ({ row }) => row.original.orderCount },
];
