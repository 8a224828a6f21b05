import type { ColumnDef } from '@tanstack/react-table';
import { Link } from 'react-router-dom';
import { PIECE_STATES } from '../../../../shared/domain/ledger/state-machine';
import type { SpecimenView } from '../../../../shared/schemas/specimens';
import { Mono } from '../../../components/ui/detail-list';
import { StateBadge, stateLabel } from '../../../components/ui/state-badge';
import { paths } from '../../../config/paths';

/** Columns of the specimen list; sortable ones carry the server's sort key as id. */
export const specimenColumns: ColumnDef<SpecimenView>[] = [
  {
    id: 'code',
    header: 'Specimen',
    enableSorting: true,
    cell: ({ row }) => (
      <Link to={paths.specimen.href(row.original.code)} className="font-semibold text-temper-700 underline-offset-2 hover:underline">
        <Mono>{row.original.code}</Mono>
      </Link>
    ),
  },
  { id: 'state', header: 'State', enableSorting: true, cell: ({ row }) => <StateBadge state={row.original.state} /> },
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
    id: 'sample',
    header: 'Sample',
    cell: ({ row }) => (
      <Link to={paths.sample.href(row.original.sampleId)} className="hover:underline">
        <Mono>{row.original.sampleCode}</Mono>
      </Link>
    ),
  },
  { id: 'geometry', header: 'Geometry', cell: ({ row }) => <span className="text-caption">{row.original.shape} · {row.original.geometryKey}</span> },
];

/** State filter choices. */
export const SPECIMEN_STATE_OPTIONS = PIECE_STATES.map((s) => ({ value: s, label: stateLabel(s) }));
