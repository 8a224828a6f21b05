import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Button, ButtonLink } from '../../components/ui/button';
import { DetailList, Mono, Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { heatQueries } from '../../features/heats/api/queries';
import { useSaveHeat } from '../../features/heats/api/save-heat';
import { HeatForm } from '../../features/heats/components/heat-form';
import { queryClient } from '../../lib/query-client';

/** Loads the heat before the screen shows. */
export function loader({ params }: LoaderFunctionArgs) {
  return queryClient.ensureQueryData(heatQueries.detail(Number(params.id)));
}

/** One heat: what it is, the orders it is on, and the samples taken from it. */
export function HeatRoute() {
  const id = Number(useParams().id);
  const { data: heat } = useSuspenseQuery(heatQueries.detail(id));
  const save = useSaveHeat(id);
  const [editing, setEditing] = useState(false);
  return (
    <>
      <PageHeader
        title={`Heat ${heat.heatNumber}`}
        subtitle={`${heat.material}, ${heat.grade} · ${heat.producer}`}
        actions={
          <>
            <ButtonLink to={`${paths.specimens.path}?heatId=${heat.id}`}>Specimens ({heat.specimenCount})</ButtonLink>
            {heat.canWrite && !editing ? <Button onClick={() => setEditing(true)}>Change</Button> : null}
          </>
        }
      />
      <div className="flex flex-col gap-5">
        <Panel>
          {editing ? (
            <HeatForm heat={heat} save={save.mutateAsync} submitLabel="Save changes" onSaved={() => setEditing(false)} onCancel={() => setEditing(false)} />
          ) : (
            <DetailList
              items={[
                { label: 'Heat number', value: <Mono>{heat.heatNumber}</Mono> },
                { label: 'Material', value: heat.material },
                { label: 'Grade', value: heat.grade },
                { label: 'Producer', value: heat.producer },
                { label: 'Certificate', value: heat.certificateRef },
              ]}
            />
          )}
        </Panel>
        <Panel title="Orders">
          {heat.orders.length === 0 ? (
            <p className="text-ink-500">Not on any order yet.</p>
          ) : (
            <ul className="flex flex-col gap-1">
              {heat.orders.map((o) => (
                <li key={o.id}>
                  <Link to={paths.order.href(o.id)} className="font-semibold text-temper-700 hover:underline">
                    <Mono>{o.number}</Mono>
                  </Link>{' '}
                  · {o.customerName}
                </li>
              ))}
            </ul>
          )}
        </Panel>
        <Panel title="Samples">
          {heat.samples.length === 0 ? (
            <p className="text-ink-500">No samples taken yet.</p>
          ) : (
            <ul className="flex flex-col gap-1">
              {heat.samples.map((s) => (
                <li key={s.id}>
                  <Link to={paths.sample.href(s.id)} className="font-semibold text-temper-700 hover:underline">
                    <Mono>{s.code}</Mono>
                  </Link>{' '}
                  · {s.position}, {s.orientation} · order <Mono>{s.orderNumber}</Mono> · {s.specimenCount} specimens
                </li>
              ))}
            </ul>
          )}
        </Panel>
      </div>
    </>
  );
}
