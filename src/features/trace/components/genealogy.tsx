import { Link } from 'react-router-dom';
import type { TraceView } from '../../../../shared/schemas/trace';
import { DetailList, Mono } from '../../../components/ui/detail-list';
import { StateBadge } from '../../../components/ui/state-badge';
import { paths } from '../../../config/paths';

const linkClass = 'font-semibold text-temper-700 hover:underline';

/** Order → heat → sample → specimen → halves, and where the item sits now. */
export function Genealogy({ trace }: { trace: TraceView }) {
  const g = trace.genealogy;
  const items = [
    { label: 'Customer', value: g.customer ? g.customer.name : null },
    {
      label: 'Order',
      value: g.order ? (
        <span>
          <Link to={paths.order.href(g.order.id)} className={linkClass}>
            <Mono>{g.order.number}</Mono>
          </Link>{' '}
          · PO <Mono>{g.order.poReference}</Mono> · {g.order.materialSpec}
        </span>
      ) : null,
    },
    {
      label: 'Heat',
      value: g.heat ? (
        <span>
          <Link to={paths.heat.href(g.heat.id)} className={linkClass}>
            <Mono>{g.heat.heatNumber}</Mono>
          </Link>{' '}
          · {g.heat.material} {g.heat.grade} · {g.heat.producer}
        </span>
      ) : null,
    },
    {
      label: 'Sample',
      value: g.sample ? (
        <span>
          <Link to={paths.sample.href(g.sample.id)} className={linkClass}>
            <Mono>{g.sample.code}</Mono>
          </Link>{' '}
          · {g.sample.position}, {g.sample.orientation}
        </span>
      ) : null,
    },
    {
      label: 'Specimen',
      value: g.specimen ? (
        <span className="inline-flex flex-wrap items-center gap-2">
          <Link to={paths.trace.href(g.specimen.code)} className={linkClass}>
            <Mono>{g.specimen.code}</Mono>
          </Link>
          <StateBadge state={g.specimen.state} />
        </span>
      ) : null,
    },
    {
      label: 'Halves',
      value: g.halves.length ? (
        <span className="flex flex-col gap-1">
          {g.halves.map((h) => (
            <span key={h.code} className="inline-flex flex-wrap items-center gap-2">
              <Link to={paths.trace.href(h.code)} className={linkClass}>
                <Mono>{h.code}</Mono>
              </Link>
              <span className="text-caption text-ink-500">half {h.side}</span>
              <StateBadge state={h.state} />
            </span>
          ))}
        </span>
      ) : null,
    },
    {
      label: 'Where it is now',
      value: (
        <span className="flex flex-col gap-0.5" data-testid="trace-location">
          {g.containers.length
            ? g.containers.map((c) => (
                <Link key={c.code} to={paths.trace.href(c.code)} className={linkClass}>
                  {c.name} <Mono>({c.code})</Mono>
                </Link>
              ))
            : trace.location.text}
          {trace.location.station ? <span className="text-caption text-ink-500">last seen at {trace.location.station.name}</span> : null}
        </span>
      ),
    },
  ];
  if (g.contents.length) {
    items.push({
      label: `Contents (${g.contents.length})`,
      value: (
        <span className="flex flex-wrap gap-2">
          {g.contents.map((c) => (
            <Link key={c.code} to={paths.trace.href(c.code)} className={linkClass}>
              <Mono>{c.code}</Mono>
            </Link>
          ))}
        </span>
      ),
    });
  }
  return <DetailList items={items} />;
}
