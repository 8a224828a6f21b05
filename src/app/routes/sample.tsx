import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { DetailList, Mono, Panel } from '../../components/ui/detail-list';
import { FormAlert } from '../../components/ui/form-field';
import { PageHeader } from '../../components/ui/page-header';
import { StateBadge } from '../../components/ui/state-badge';
import { paths } from '../../config/paths';
import { sampleQueries } from '../../features/samples/api/queries';
import { SampleForm } from '../../features/samples/components/sample-form';
import { useCreateSpecimen } from '../../features/specimens/api/save-specimen';
import { queryClient } from '../../lib/query-client';

/** Loads the sample before the screen shows. */
export function loader({ params }: LoaderFunctionArgs) {
  return queryClient.ensureQueryData(sampleQueries.detail(Number(params.id)));
}

/** One sample: where it was taken, its order and heat, and the specimens cut from it. */
export function SampleRoute() {
  const id = Number(useParams().id);
  const { data: sample } = useSuspenseQuery(sampleQueries.detail(id));
  const [editing, setEditing] = useState(false);
  const addSpecimen = useCreateSpecimen();
  return (
    <>
      <PageHeader
        title={`Sample ${sample.code}`}
        subtitle={
          <>
            Order{' '}
            <Link to={paths.order.href(sample.orderId)} className="font-semibold text-temper-700 hover:underline">
              <Mono>{sample.orderNumber}</Mono>
            </Link>{' '}
            · heat{' '}
            <Link to={paths.heat.href(sample.heatId)} className="font-semibold text-temper-700 hover:underline">
              <Mono>{sample.heatNumber}</Mono>
            </Link>{' '}
            · {sample.customerName}
          </>
        }
        actions={sample.canWrite && !editing ? <Button onClick={() => setEditing(true)}>Change</Button> : null}
      />
      <div className="flex flex-col gap-5">
        <Panel>
          {editing ? (
            <SampleForm
              orderId={sample.orderId}
              heats={[{ value: sample.heatId, label: sample.heatNumber }]}
              sample={sample}
              onSaved={() => setEditing(false)}
              onCancel={() => setEditing(false)}
            />
          ) : (
            <DetailList
              items={[
                { label: 'Position', value: sample.position },
                { label: 'Orientation', value: sample.orientation },
                { label: 'Thickness', value: sample.thicknessMm ? `${sample.thicknessMm} mm` : null },
                { label: 'Grade', value: sample.grade },
              ]}
            />
          )}
        </Panel>
        <Panel
          title={`Specimens (${sample.specimens.length})`}
          actions={
            sample.canWrite ? (
              <Button variant="secondary" busy={addSpecimen.isPending} onClick={() => addSpecimen.mutate({ sampleId: sample.id })}>
                Register one more specimen
              </Button>
            ) : null
          }
        >
          <FormAlert>{addSpecimen.error ? addSpecimen.error.message : null}</FormAlert>
          {sample.specimens.length === 0 ? (
            <p className="text-ink-500">No specimens yet.</p>
          ) : (
            <ul className="divide-y divide-ink-100">
              {sample.specimens.map((s) => (
                <li key={s.id} className="flex flex-wrap items-center justify-between gap-2 py-2">
                  <Link to={paths.specimen.href(s.code)} className="font-semibold text-temper-700 hover:underline">
                    <Mono>{s.code}</Mono>
                  </Link>
                  <span className="flex items-center gap-2 text-caption text-ink-500">
                    {s.shape} · {s.geometryKey} <StateBadge state={s.state} />
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Panel>
      </div>
    </>
  );
}
