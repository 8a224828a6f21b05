import type { ColumnDef } from '@tanstack/react-table';
import type { CustomerView } from '../../../../shared/schemas/customers';
import { linkColumn } from '../../../components/ui/link-column';
import { paths } from '../../../config/paths';

/** Columns of the customer list; sortable ones carry the server's sort key as id. */
export const customerColumns: ColumnDef<CustomerView>[] = [
  linkColumn<CustomerView>({ id: 'name', header: 'Name', sortable: true, primary: true, mono: false, href: (r) => paths.customer.href(r.id), text: (r) => r.name }),
  { id: 'contactEmail', header: 'Contact', cell: ({ row }) => row.original.contactEmail ?? '—' },
  { id: 'retentionDays', header: 'Retention', cell: ({ row }) => (row.original.retentionDays === null ? 'Lab default' : `${row.original.retentionDays} days`) },
  { id: 'orders', header: 'Orders', enableSorting: true, cell: ({ row }) => row.original.orderCount },
];
