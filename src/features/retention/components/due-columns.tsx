import type { ColumnDef } from '@tanstack/react-table';
import type { DueItemView } from '../../../../shared/schemas/retention';
import { StateBadge } from '../../../components/ui/state-badge';

/** How each verdict reads, with its shape so colour is never needed. */
export const VERDICTS: Record<DueItemView['status'], { label: string; glyph: string; tone: string }> = {
  may_go: { label: 'May go', glyph: '◆', tone: 'text-good-700' },
  not_due: { label: 'Not due', glyph: '○', tone: 'text-ink-600' },
  held: { label: 'Held', glyph: '▲', tone: 'text-warn-700' },
  not_retained: { label: 'Not retained', glyph: '■', tone: 'text-stop-700' },
};

/** The verdict of one item, by word and shape. */
export function Verdict({ status }: { status: DueItemView['status'] }) {
  const v = VERDICTS[status];
  return (
    <span className={`inline-flex items-center gap-1 font-semibold ${v.tone}`} data-verdict={status}>
      <span aria-hidden>{v.glyph}</span>
      {v.label}
    </span>
  );
}

function ruleText(item: DueItemView): string {
  if (!item.rule) return '—';
  const parts = [
    item.rule.years ? `${item.rule.years} y` : '',
    item.rule.months ? `${item.rule.months} mo` : '',
    item.rule.days !== undefined ? `${item.rule.days} d` : '',
  ].filter(Boolean);
  return `${parts.join(' ')} after ${item.rule.basis} (${item.source})`;
}

/** The due list's columns; ids are the server's sort keys. */
export const dueColumns: ColumnDef<DueItemView>[] = [
  {
    id: 'code',
    header: 'Item',
    enableSorting: true,
    cell: ({ row }) => (
      <span className="flex flex-col">
        <span className="font-mono">{row.original.code}</span>
        <span className="text-caption text-ink-500">{row.original.kind === 'half' ? `half of ${row.original.specimen ?? ''}` : 'specimen'}</span>
      </span>
    ),
  },
  { id: 'status', header: 'Verdict', enableSorting: true, cell: ({ row }) => <Verdict status={row.original.status} /> },
  {
    id: 'notBefore',
    header: 'May go from',
    enableSorting: true,
    cell: ({ row }) => (
      <span className="flex flex-col">
        <span className="font-mono">{row.original.firstDay ?? 'no date yet'}</span>
        <span className="text-caption text-ink-500">{ruleText(row.original)}</span>
      </span>
    ),
  },
  { id: 'order', header: 'Order', enableSorting: true, cell: ({ row }) => row.original.order },
  { id: 'heat', header: 'Heat', enableSorting: true, cell: ({ row }) => row.original.heat },
  { id: 'customer', header: 'Customer', enableSorting: true, cell: ({ row }) => row.original.customer },
  {
    id: 'location',
    header: 'Where',
    enableSorting: true,
    cell: ({ row }) => (
      <span className="flex flex-col gap-1">
        <span className="text-caption">{row.original.location}</span>
        <StateBadge state={row.original.state} />
      </span>
    ),
  },
  {
    id: 'why',
    header: 'Why',
    cell: ({ row }) => <span className="text-caption text-ink-600">{row.original.holds.length > 0 ? row.original.holds.map((h) => `${h.scope} ${h.ref}: ${h.reason}`).join('; ') : row.original.message}</span>,
  },
];
