import type { ColumnDef } from '@tanstack/react-table';
import { ORDER_STATUS_LABELS, type OrderView } from '../../../../shared/schemas/orders';
import { linkColumn } from '../../../components/ui/link-column';
import { paths } from '../../../config/paths';
import { OrderStatusTag } from './order-status-tag';

/** Columns of the order list; sortable ones carry the server's sort key as id. */
export const orderColumns: ColumnDef<OrderView>[] = [
  linkColumn<OrderView>({ id: 'number', header: 'Order', sortable: true, primary: true, href: (r) => paths.order.href(r.id), text: (r) => r.number }),
  { id: 'customer', header: 'Customer', enableSorting: true, cell: ({ row }) => row.original.customerName },
  { id: 'materialSpec', header: 'Specification', cell: ({ row }) => row.original.materialSpec },
  { id: 'heats', header: 'Heats', cell: ({ row }) => row.original.heatCount },
  { id: 'specimens', header: 'Specimens', cell: ({ row }) => row.original.specimenCount },
  { id: 'dueDate', header: 'Due', enableSorting: true, cell: ({ row }) => row.original.dueDate ?? '—' },
  { id: 'status', header: 'Status', enableSorting: true, cell: ({ row }) => <OrderStatusTag status={row.original.status} /> },
];

/** Status filter choices. */
export const ORDER_STATUS_OPTIONS = Object.entries(ORDER_STATUS_LABELS).map(([value, label]) => ({ value, label }));
