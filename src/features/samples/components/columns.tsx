import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { SampleView } from '../../../../shared/schemas/samples';
import { Mono } from '../../../components/ui/detail-list';
import { paths } from '../../../config/paths';

/** Columns of the sample list; sortable ones carry the server's sort key as id. */
export const sampleColumns: ColumnDef<SampleView>[] = [
  {
    id: 'code',
    header: 'Sample',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.sample.href(row.original.id)} className="font-semibold text-temper-700 underline-offset-2 hover:underline">
        <Mono>{row.original.code}</Mono>
      </Link>
    ),
  },
  {
    id: 'order',
    header: 'Order',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.order.href(row.original.orderId)} className="hover:underline">
        <Mono>{row.original.orderNumber}</Mono>
      </Link>
    ),
  },
  {
    id: 'heat',
    header: 'Heat',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.heat.href(row.original.heatId)} className="hover:underline">
        <Mono>{row.original.heatNumber}</Mono>
      </Link>
    ),
  },
  { id: 'position', header: 'Position', cell: ({ row }) => row.original.position },
  { id: 'orientation', header: 'Orientation', cell: ({ row }) => row.original.orientation },
  { id: 'specimens', header: 'Specimens', cell: ({ row }) => row.original.specimenCount },
];
