import { useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import type { SpecimenNominal } from '../../../shared/schemas/specimens';
import { Button, ButtonLink } from '../../components/ui/button';
import { DetailList, Mono, Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { StateBadge } from '../../components/ui/state-badge';
import { paths } from '../../config/paths';
import { specimenQueries } from '../../features/specimens/api/queries';
import { SpecimenPlanForm } from '../../features/specimens/components/specimen-plan-form';
import { queryClient } from '../../lib/query-client';

/** Loads the specimen (by id or code) before the screen shows. */
export function loader({ params }: LoaderFunctionArgs) {
  return queryClient.ensureQueryData(specimenQueries.detail(params.idOrCode ?? ''));
}

function sized(size: { nominal: string; tolerance: string | null } | undefined): string {
  // A specimen registered without its nominal sizes (older records) still shows, with a dash.
  if (!size) return '—';
  return size.tolerance ? `${size.nominal} ± ${size.tolerance} mm` : `${size.nominal} mm`;
}

function nominalItems(n: SpecimenNominal) {
  if (n.shape === 'flat') {
    return [
      { label: 'Width', value: sized(n.width) },
      { label: 'Gauge length', value: sized(n.gaugeLength) },
      { label: 'Thickness', value: n.thickness ? `${n.thickness} mm (the sample’s)` : 'The product’s own' },
      { label: 'Thickness limit', value: n.maxThickness ? `≤ ${n.maxThickness} mm` : 'See the standard' },
    ];
  }
  return [
    { label: 'Diameter', value: sized(n.diameter) },
    { label: 'Gauge length', value: sized(n.gaugeLength) },
  ];
}

/** One specimen: its code, state, where it came from (order → heat → sample), and its nominal sizes. */
export function SpecimenRoute() {
  const ref = useParams().idOrCode ?? '';
  const { data: specimen } = useSuspenseQuery(specimenQueries.detail(ref));
  const [editing, setEditing] = useState(false);
  return (
    <>
      <PageHeader
        title={specimen.code}
        subtitle={<StateBadge state={specimen.state} />}
        actions={
          <>
            <ButtonLink to={paths.trace.href(specimen.code)} data-testid="specimen-trace-link">
              Trace
            </ButtonLink>
            <ButtonLink to={paths.resultsSpecimen.href(specimen.code)} data-testid="specimen-results-link">
              Results
            </ButtonLink>
            {specimen.canWrite && specimen.state === 'registered' && !editing ? <Button onClick={() => setEditing(true)}>Change plan</Button> : null}
          </>
        }
      />
      <div className="flex flex-col gap-5">
        <Panel title="Where it comes from">
          <DetailList
            items={[
              { label: 'Customer', value: specimen.customerName },
              {
                label: 'Order',
                value: (
                  <Link to={paths.order.href(specimen.orderId)} className="font-semibold text-temper-700 hover:underline">
                    <Mono>{specimen.orderNumber}</Mono>
                  </Link>
                ),
              },
              {
                label: 'Heat',
                value: (
                  <Link to={paths.heat.href(specimen.heatId)} className="font-semibold text-temper-700 hover:underline">
                    <Mono>{specimen.heatNumber}</Mono>
                  </Link>
                ),
              },
              {
                label: 'Sample',
                value: (
                  <Link to={paths.sample.href(specimen.sampleId)} className="font-semibold text-temper-700 hover:underline">
                    <Mono>{specimen.sampleCode}</Mono>
                  </Link>
                ),
              },
              { label: 'Position', value: `${specimen.position}, ${specimen.orientation}` },
              { label: 'Grade', value: specimen.grade },
            ]}
          />
        </Panel>
        <Panel title="Plan">
          {editing ? (
            <SpecimenPlanForm specimen={specimen} onSaved={() => setEditing(false)} onCancel={() => setEditing(false)} />
          ) : (
            <>
              <DetailList
                items={[
                  { label: 'Shape', value: specimen.shape },
                  { label: 'Geometry', value: specimen.geometryLabel ?? specimen.geometryKey },
                  { label: 'Test standard', value: specimen.testStandard },
                  ...nominalItems(specimen.nominal),
                ]}
              />
              <p className="mt-4 text-caption text-ink-500">
                Nominal sizes from {specimen.nominal.standard}, {specimen.nominal.source}.
              </p>
            </>
          )}
        </Panel>
      </div>
    </>
  );
}
