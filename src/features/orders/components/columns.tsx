import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { ORDER_STATUS_LABELS, type OrderView } from '../../../../shared/schemas/orders';
import { Mono } from '../../../components/ui/detail-list';
import { paths } from '../../../config/paths';
import { OrderStatusTag } from './order-status-tag';

/** Columns of the order list; sortable ones carry the server's sort key as id. */
export const orderColumns: ColumnDef<OrderView>[] = [
  {
    id: 'number',
    header: 'Order',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.order.href(row.original.id)} className="font-semibold text-temper-700 underline-offset-2 hover:underline">
        <Mono>{row.original.number}</Mono>
      </Link>
    ),
  },
  { id: 'customer', header: 'Customer', enableSorting: true, cell: ({ row }) => row.original.customerName },
  { id: 'materialSpec', header: 'Specification', cell: ({ row }) => row.original.materialSpec },
  { id: 'heats', header: 'Heats', cell: ({ row }) => row.original.heatCount },
  { id: 'specimens', header: 'Specimens', cell: ({ row }) => row.original.specimenCount },
  { id: 'dueDate', header: 'Due', enableSorting: true, cell: ({ row }) => row.original.dueDate ?? '—' },
  { id: 'status', header: 'Status', enableSorting: true, cell: ({ row }) => <OrderStatusTag status={row.original.status} /> },
];

/** Status filter choices. */
export const ORDER_STATUS_OPTIONS = Object.entries(ORDER_STATUS_LABELS).map(([value, label]) => ({ value, label }));
