import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import type { HeatView } from '../../../../shared/schemas/heats';
import { Mono } from '../../../components/ui/detail-list';
import { paths } from '../../../config/paths';

/** Columns of the heat list; sortable ones carry the server's sort key as id. */
export const heatColumns: ColumnDef<HeatView>[] = [
  {
    id: 'heatNumber',
    header: 'Heat',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.heat.href(row.original.id)} className="font-semibold text-temper-700 underline-offset-2 hover:underline">
        <Mono>{row.original.heatNumber}</Mono>
      </Link>
    ),
  },
  { id: 'material', header: 'Material', cell: ({ row }) => row.original.material },
  { id: 'grade', header: 'Grade', enableSorting: true, cell: ({ row }) => row.original.grade },
  { id: 'producer', header: 'Producer', enableSorting: true, cell: ({ row }) => row.original.producer },
  { id: 'orders', header: 'Orders', cell: ({ row }) => row.original.orderCount },
  { id: 'specimens', header: 'Specimens', cell: ({ row }) => row.original.specimenCount },
];
