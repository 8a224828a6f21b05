import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import type { FloorView } from '../../../shared/schemas/floor';
import { api } from '../../lib/api-client';
import { PageHeader } from '../../components/ui/page-header';
import { StateBadge } from '../../components/ui/state-badge';
import { floorQueries } from '../../features/floor/api/queries';
import { useCan } from '../../features/auth/api/queries';

interface Health {
  ok: boolean;
  db: string;
  migration: string | null;
}

/** "3 h 20 min" from an instant to now. */
function waitedSince(iso: string | null): string {
  if (!iso) return '—';
  const minutes = Math.max(0, Math.round((Date.now() - Date.parse(iso)) / 60_000));
  if (minutes < 60) return `${minutes} min`;
  const hours = Math.floor(minutes / 60);
  return hours < 48 ? `${hours} h ${minutes % 60} min` : `${Math.floor(hours / 24)} d ${hours % 24} h`;
}

function StationQueues({ stations }: { stations: FloorView['stations'] }) {
  const max = Math.max(1, ...stations.map((s) => s.count));
  return (
    <ul className="grid grid-cols-2 gap-3 lg:grid-cols-3">
      {stations.map((s) => (
        <li key={s.code} className="rounded-card bg-white p-4 shadow-sm ring-1 ring-ink-100" data-testid={`station-${s.code}`}>
          <div className="flex flex-wrap items-baseline justify-between gap-x-2">
            <p className="font-semibold">{s.name}</p>
            <p className="font-mono text-caption text-ink-500">{s.code}</p>
          </div>
          <p className="mt-2 text-title leading-none md:text-display">{s.count}</p>
          <p className="text-caption text-ink-500">{s.count === 1 ? 'piece waiting' : 'pieces waiting'} · oldest {waitedSince(s.oldestSince)}</p>
          <div className="mt-3 h-2 rounded-full bg-ink-100" aria-hidden>
            <div className="h-2 rounded-full bg-temper-400" style={{ width: `${(s.count / max) * 100}%` }} />
          </div>
        </li>
      ))}
    </ul>
  );
}

/** The floor: where work stands across the lab, station by station and state by state. */
export function HomeRoute() {
  const canRead = useCan('lab.read');
  const canScan = useCan('events.record');
  const floor = useQuery({ ...floorQueries.view(), enabled: canRead });
  const health = useQuery({ queryKey: ['health'], queryFn: () => api<Health>('/health') });
  return (
    <>
      <PageHeader
        title="Floor"
        subtitle="Where every specimen and half stands right now."
        actions={
          canScan ? (
            <Link to="/scan" className="rounded-md bg-ink-900 px-4 py-2 font-semibold text-white">
              Scan
            </Link>
          ) : undefined
        }
      />
      {floor.data ? (
        <div className="flex flex-col gap-6">
          <section aria-labelledby="queues">
            <h2 id="queues" className="mb-3 text-lead font-semibold">
              Work at each station
            </h2>
            <StationQueues stations={floor.data.stations} />
          </section>
          <section aria-labelledby="states" className="rounded-card bg-white p-5 shadow-sm ring-1 ring-ink-100">
            <h2 id="states" className="text-lead font-semibold">
              Items by state
            </h2>
            <p className="text-caption text-ink-500">{floor.data.eventsLast24h} custody events in the last 24 hours</p>
            <ul className="mt-3 grid gap-2 sm:grid-cols-2 lg:grid-cols-3">
              {floor.data.states.map((s) => (
                <li key={`${s.kind}-${s.state}`} className="flex items-center justify-between gap-3 rounded-md px-2 py-1 ring-1 ring-ink-100">
                  <span className="flex items-center gap-2">
                    <span className="text-caption text-ink-500">{s.kind}</span>
                    <StateBadge state={s.state} />
                  </span>
                  <span className="font-mono font-semibold">{s.count}</span>
                </li>
              ))}
            </ul>
          </section>
        </div>
      ) : floor.isError ? (
        <p role="alert" className="text-stop-700">
          {floor.error.message}
        </p>
      ) : null}
      <p className="mt-6 text-caption text-ink-500" data-testid="health">
        {health.isPending ? 'Checking the database …' : health.data?.ok ? `Database up · schema ${health.data.migration}` : 'The database is not answering.'}
      </p>
    </>
  );
}
