import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { STATION_KIND_LABELS } from '../../../shared/schemas/stations';
import { PageHeader } from '../../components/ui/page-header';
import { useCan } from '../../features/auth/api/queries';
import { stationQueries, useRevokeToken, useSetStationActive } from '../../features/stations/api/queries';
import { NewStationForm, NewTokenForm } from '../../features/stations/components/station-forms';

function StationTokens({ id, canWrite }: { id: number; canWrite: boolean }) {
  const detail = useQuery(stationQueries.detail(id));
  const revoke = useRevokeToken(id);
  if (!detail.data) return <p className="text-ink-500">Loading tokens …</p>;
  return (
    <div className="mt-3 flex flex-col gap-4">
      <ul className="flex flex-col gap-2">
        {(detail.data.tokens ?? []).map((t) => (
          <li key={t.id} className="flex flex-wrap items-center justify-between gap-2 rounded-md bg-ink-50 px-3 py-2">
            <span>
              <span className="font-semibold">{t.name}</span> <span className="font-mono text-ink-600">{t.prefix}…</span>
              <span className="block text-caption text-ink-600">{t.eventTypes.join(', ')} · {t.lastUsedAt ? `last used ${new Date(t.lastUsedAt).toLocaleString()}` : 'never used'}</span>
            </span>
            {t.revokedAt ? (
              <span className="text-ink-500">◇ revoked</span>
            ) : canWrite ? (
              <button type="button" onClick={() => revoke.mutate(t.id)} className="rounded-md px-3 py-1 font-semibold text-stop-700 ring-1 ring-stop-500">Revoke</button>
            ) : (
              <span className="text-good-700">■ live</span>
            )}
          </li>
        ))}
        {detail.data.tokens?.length === 0 ? <li className="text-ink-500">No tokens.</li> : null}
      </ul>
      {canWrite && detail.data.active ? <NewTokenForm stationId={id} /> : null}
    </div>
  );
}

/** Stations where hand-offs happen, and the tokens their instruments post events with. */
export function StationsRoute() {
  const list = useQuery(stationQueries.list());
  const canWrite = useCan('stations.write');
  const setActive = useSetStationActive();
  const [open, setOpen] = useState<number | null>(null);
  return (
    <>
      <PageHeader title="Stations" subtitle="Where hand-offs happen, and the instruments that post from them." />
      {canWrite ? (
        <section className="mb-5 rounded-card bg-white p-4 ring-1 ring-ink-100"><NewStationForm /></section>
      ) : null}
      {list.error ? <p role="alert" className="text-stop-700">▲ {list.error.message}</p> : null}
      <ul className="flex flex-col gap-3">
        {list.data?.items.map((s) => (
          <li key={s.id} className="rounded-card bg-white p-4 ring-1 ring-ink-100">
            <div className="flex flex-wrap items-center justify-between gap-2">
              <button type="button" onClick={() => setOpen(open === s.id ? null : s.id)} className="text-left" aria-expanded={open === s.id}>
                <span className="font-mono font-semibold">{s.code}</span> <span className="font-semibold">{s.name}</span>
                <span className="block text-caption text-ink-600">{STATION_KIND_LABELS[s.kind]} · {s.activeTokens} live token{s.activeTokens === 1 ? '' : 's'} · {s.active ? '■ active' : '◇ inactive'}</span>
              </button>
              {canWrite ? (
                <button type="button" onClick={() => setActive.mutate({ id: s.id, active: !s.active })} className="rounded-md px-3 py-1 font-semibold ring-1 ring-ink-300">
                  {s.active ? 'Deactivate' : 'Activate'}
                </button>
              ) : null}
            </div>
            {open === s.id ? <StationTokens id={s.id} canWrite={canWrite} /> : null}
          </li>
        ))}
      </ul>
    </>
  );
}
