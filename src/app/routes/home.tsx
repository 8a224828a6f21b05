import { useQuery } from '@tanstack/react-query';
import { api } from '../../lib/api-client';
import { PageHeader } from '../../components/ui/page-header';
import { StateBadge } from '../../components/ui/state-badge';

interface Health {
  ok: boolean;
  db: string;
  migration: string | null;
}

const LIFE = ['registered', 'cut', 'conditioning', 'measured', 'tested', 'binned', 'retained', 'held', 'disposed'];

/** The floor: where work stands across the lab. */
export function HomeRoute() {
  const health = useQuery({ queryKey: ['health'], queryFn: () => api<Health>('/health') });
  return (
    <>
      <PageHeader title="Floor" subtitle="Where every specimen and half stands right now." />
      <section className="rounded-card bg-white p-5 shadow-sm ring-1 ring-ink-100">
        <h2 className="text-lead font-semibold">System</h2>
        <p className="mt-2 text-body" data-testid="health">
          {health.isPending ? 'Checking the database …' : health.data?.ok ? `Database up · schema ${health.data.migration}` : 'The database is not answering.'}
        </p>
        <h2 className="mt-6 text-lead font-semibold">How states read</h2>
        <ul className="mt-3 flex flex-wrap gap-2">
          {LIFE.map((s) => (
            <li key={s}>
              <StateBadge state={s} />
            </li>
          ))}
        </ul>
      </section>
    </>
  );
}
