import type { ColumnDef } from '@tanstack/react-table';
import type { HeatView } from '../../../../shared/schemas/heats';
import { linkColumn } from '../../../components/ui/link-column';
import { paths } from '../../../config/paths';

/** Columns of the heat list; sortable ones carry the server's sort key as id. */
export const heatColumns: ColumnDef<HeatView>[] = [
  linkColumn<HeatView>({ id: 'heatNumber', header: 'Heat', sortable: true, primary: true, href: (r) => paths.heat.href(r.id), text: (r) => r.heatNumber }),
  { id: 'material', header: 'Material', cell: ({ row }) => row.original.material },
  { id: 'grade', header: 'Grade', enableSorting: true, cell: ({ row }) => row.original.grade },
  { id: 'producer', header: 'Producer', enableSorting: true, cell: ({ row }) => row.original.producer },
  { id: 'orders', header: 'Orders', cell: ({ row }) => row.original.orderCount },
  { id: 'specimens', header: 'Specimens', cell: ({ row }) => row.original.specimenCount },
];
