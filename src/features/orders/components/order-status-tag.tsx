import { ORDER_STATUS_LABELS, type OrderStatus } from '../../../../shared/schemas/orders';

const MARK: Record<OrderStatus, string> = { open: '○', in_test: '◐', reported: '●', closed: '■' };

/** An order's status by word and shape. */
export function OrderStatusTag({ status }: { status: OrderStatus }) {
  return (
    <span className="inline-flex items-center gap-1 whitespace-nowrap rounded-full bg-ink-100 px-2 py-0.5 text-caption font-semibold text-ink-800" data-status={status}>
      <span aria-hidden>{MARK[status]}</span>
      {ORDER_STATUS_LABELS[status]}
    </span>
  );
}
