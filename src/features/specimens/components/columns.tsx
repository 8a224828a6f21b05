import type { ColumnDef } from '@tanstack/react-table';
import { PIECE_STATES } from '../../../../shared/domain/ledger/state-machine';
import type { SpecimenView } from '../../../../shared/schemas/specimens';
import { StateBadge, stateLabel } from '../../../components/ui/state-badge';
import { linkColumn } from '../../../components/ui/link-column';
import { paths } from '../../../config/paths';

/** Columns of the specimen list; sortable ones carry the server's sort key as id. */
export const specimenColumns: ColumnDef<SpecimenView>[] = [
  linkColumn<SpecimenView>({ id: 'code', header: 'Specimen', sortable: true, primary: true, href: (r) => paths.specimen.href(r.code), text: (r) => r.code }),
  { id: 'state', header: 'State', enableSorting: true, cell: ({ row }) => <StateBadge state={row.original.state} /> },
  linkColumn<SpecimenView>({ id: 'heat', header: 'Heat', sortable: true, href: (r) => paths.heat.href(r.heatId), text: (r) => r.heatNumber }),
  linkColumn<SpecimenView>({ id: 'order', header: 'Order', sortable: true, href: (r) => paths.order.href(r.orderId), text: (r) => r.orderNumber }),
  linkColumn<SpecimenView>({ id: 'sample', header: 'Sample', href: (r) => paths.sample.href(r.sampleId), text: (r) => r.sampleCode }),
  { id: 'geometry', header: 'Geometry', cell: ({ row }) => <span className="text-caption">{row.original.shape} · {row.original.geometryKey}</span> },
];

/** State filter choices. */
export const SPECIMEN_STATE_OPTIONS = PIECE_STATES.map((s) => ({ value: s, label: stateLabel(s) }));
