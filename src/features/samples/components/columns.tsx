import type { ColumnDef } from '@tanstack/react-table';
import type { SampleView } from '../../../../shared/schemas/samples';
import { linkColumn } from '../../../components/ui/link-column';
import { paths } from '../../../config/paths';

/** Columns of the sample list; sortable ones carry the server's sort key as id. */
export const sampleColumns: ColumnDef<SampleView>[] = [
  linkColumn<SampleView>({ id: 'code', header: 'Sample', sortable: true, primary: true, href: (r) => paths.sample.href(r.id), text: (r) => r.code }),
  linkColumn<SampleView>({ id: 'order', header: 'Order', sortable: true, href: (r) => paths.order.href(r.orderId), text: (r) => r.orderNumber }),
  linkColumn<SampleView>({ id: 'heat', header: 'Heat', sortable: true, href: (r) => paths.heat.href(r.heatId), text: (r) => r.heatNumber }),
  { id: 'position', header: 'Position', cell: ({ row }) => row.original.position },
  { id: 'orientation', header: 'Orientation', cell: ({ row }) => row.original.orientation },
  { id: 'specimens', header: 'Specimens', cell: ({ row }) => row.original.specimenCount },
];
