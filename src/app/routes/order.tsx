import { useQuery, useSuspenseQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { Link, useParams, type LoaderFunctionArgs } from 'react-router-dom';
import { getGeometry } from '../../../shared/domain/specimen-geometries';
import { TEST_LABELS } from '../../../shared/schemas/orders';
import { Button, ButtonLink } from '../../components/ui/button';
import { DetailList, Mono, Panel } from '../../components/ui/detail-list';
import { SelectField } from '../../components/ui/form-field';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { customerQueries } from '../../features/customers/api/queries';
import { heatQueries } from '../../features/heats/api/queries';
import { HeatForm } from '../../features/heats/components/heat-form';
import { useAddOrderHeat } from '../../features/orders/api/add-order-heat';
import { orderQueries } from '../../features/orders/api/queries';
import { CutListPanel } from '../../features/orders/components/cut-list-panel';
import { OrderForm } from '../../features/orders/components/order-form';
import { OrderStatusTag } from '../../features/orders/components/order-status-tag';
import { SampleForm } from '../../features/samples/components/sample-form';
import { ApiError } from '../../lib/api-client';
import { queryClient } from '../../lib/query-client';

/** Loads the order before the screen shows. */
export function loader({ params }: LoaderFunctionArgs) {
  return queryClient.ensureQueryData(orderQueries.detail(Number(params.id)));
}

/** Puts a heat already registered on the order, chosen from a list. */
function AddExistingHeat({ orderId, onHeat }: { orderId: number; onHeat: () => void }) {
  const heats = useQuery(heatQueries.list({ sort: 'heatNumber', page: 1, pageSize: 100 }));
  const add = useAddOrderHeat(orderId);
  const [heatId, setHeatId] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      aria-label="Add an existing heat"
      onSubmit={async (e) => {
        e.preventDefault();
        setProblem(null);
        try {
          await add.mutateAsync({ heatId: Number(heatId) });
          setHeatId('');
          onHeat();
        } catch (err) {
          setProblem(err instanceof ApiError ? err.message : 'Adding the heat failed; try again.');
        }
      }}
    >
      <SelectField
        label="Registered heat"
        className="min-w-56 flex-1"
        placeholder="Choose a heat"
        value={heatId}
        onChange={(e) => setHeatId(e.target.value)}
        options={(heats.data?.items ?? []).map((h) => ({ value: h.id, label: `${h.heatNumber} · ${h.grade} · ${h.producer}` }))}
        error={problem ?? undefined}
      />
      <Button type="submit" variant="secondary" disabled={!heatId} busy={add.isPending}>
        Add heat
      </Button>
    </form>
  );
}

/**
 * One order: what was asked, its heats (add one registered or new), its cut list (made in one step
 * or imported from CSV), and its samples, each linked on to specimens.
 */
export function OrderRoute() {
  const id = Number(useParams().id);
  const { data: order } = useSuspenseQuery(orderQueries.detail(id));
  const [editing, setEditing] = useState(false);
  const [heatMode, setHeatMode] = useState<'none' | 'existing' | 'new'>('none');
  const [addingSample, setAddingSample] = useState(false);
  const addHeat = useAddOrderHeat(id);
  const customers = useQuery({ ...customerQueries.list({ sort: 'name', page: 1, pageSize: 100 }), enabled: editing });
  const geometry = getGeometry(order.geometryKey);
  return (
    <>
      <PageHeader
        title={`Order ${order.number}`}
        subtitle={
          <>
            <Link to={paths.customer.href(order.customerId)} className="font-semibold text-temper-700 hover:underline">
              {order.customerName}
            </Link>{' '}
            · PO {order.poReference} · <OrderStatusTag status={order.status} />
          </>
        }
        actions={
          <>
            <ButtonLink to={`${paths.specimens.path}?orderId=${order.id}`}>Specimens ({order.specimenCount})</ButtonLink>
            {order.canWrite && !editing ? <Button onClick={() => setEditing(true)}>Change</Button> : null}
          </>
        }
      />
      <div className="flex flex-col gap-5">
        <Panel>
          {editing ? (
            <OrderForm
              order={order}
              customers={(customers.data?.items ?? [{ id: order.customerId, name: order.customerName }]).map((c) => ({ value: c.id, label: c.name }))}
              onSaved={() => setEditing(false)}
              onCancel={() => setEditing(false)}
            />
          ) : (
            <DetailList
              items={[
                { label: 'Specification', value: order.materialSpec },
                { label: 'Tests', value: order.testsRequested.map((t) => TEST_LABELS[t as keyof typeof TEST_LABELS] ?? t).join(', ') },
                { label: 'Specimens per heat', value: order.specimensPerHeat },
                { label: 'Geometry', value: geometry ? `${geometry.label} (${geometry.standard}, ${geometry.source})` : order.geometryKey },
                { label: 'Test standard', value: order.testStandard },
                { label: 'Due', value: order.dueDate },
                { label: 'Retention', value: order.retentionDays === null ? 'Customer’s rule' : `${order.retentionDays} days after the ${order.retentionBasis}` },
              ]}
            />
          )}
        </Panel>

        <Panel
          title={`Heats (${order.heats.length})`}
          actions={
            order.canWrite && heatMode === 'none' ? (
              <>
                <Button variant="secondary" onClick={() => setHeatMode('existing')}>
                  Add a registered heat
                </Button>
                <Button onClick={() => setHeatMode('new')}>Add a new heat</Button>
              </>
            ) : null
          }
        >
          {heatMode === 'existing' ? (
            <div className="mb-4 flex flex-col gap-2">
              <AddExistingHeat orderId={id} onHeat={() => setHeatMode('none')} />
              <Button variant="ghost" size="sm" className="self-start" onClick={() => setHeatMode('none')}>
                Close
              </Button>
            </div>
          ) : null}
          {heatMode === 'new' ? (
            <div className="mb-4">
              <HeatForm
                submitLabel="Register and add heat"
                pathPrefix="heat."
                save={(heat) => addHeat.mutateAsync({ heat })}
                onSaved={() => setHeatMode('none')}
                onCancel={() => setHeatMode('none')}
              />
            </div>
          ) : null}
          {order.heats.length === 0 ? (
            <p className="text-ink-500">No heats on this order yet.</p>
          ) : (
            <ul className="divide-y divide-ink-100" aria-label="Heats on this order">
              {order.heats.map((h) => (
                <li key={h.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
                  <span>
                    <Link to={paths.heat.href(h.id)} className="font-semibold text-temper-700 hover:underline">
                      <Mono>{h.heatNumber}</Mono>
                    </Link>{' '}
                    · {h.material}, {h.grade} · {h.producer}
                  </span>
                  <span className="text-caption text-ink-500">
                    {h.sampleCount} samples · {h.specimenCount} specimens
                  </span>
                </li>
              ))}
            </ul>
          )}
        </Panel>

        {order.canWrite ? (
          <Panel title="Cut list">
            <CutListPanel order={order} />
          </Panel>
        ) : null}

        <Panel
          title={`Samples (${order.samples.length})`}
          actions={
            order.canWrite && !addingSample && order.heats.length > 0 ? (
              <Button variant="secondary" onClick={() => setAddingSample(true)}>
                Add a sample
              </Button>
            ) : null
          }
        >
          {addingSample ? (
            <div className="mb-4">
              <SampleForm
                orderId={id}
                heats={order.heats.map((h) => ({ value: h.id, label: `${h.heatNumber} · ${h.producer}` }))}
                onSaved={() => setAddingSample(false)}
                onCancel={() => setAddingSample(false)}
              />
            </div>
          ) : null}
          {order.samples.length === 0 ? (
            <p className="text-ink-500">No samples yet: make the cut list, or add a sample.</p>
          ) : (
            <ul className="divide-y divide-ink-100" aria-label="Samples of this order">
              {order.samples.map((s) => (
                <li key={s.id} className="flex flex-wrap items-baseline justify-between gap-2 py-2">
                  <span>
                    <Link to={paths.sample.href(s.id)} className="font-semibold text-temper-700 hover:underline">
                      <Mono>{s.code}</Mono>
                    </Link>{' '}
                    · heat <Mono>{s.heatNumber}</Mono> · {s.position}, {s.orientation}
                    {s.thicknessMm ? ` · ${s.thicknessMm} mm` : ''}
                  </span>
                  <Link to={`${paths.specimens.path}?sampleId=${s.id}`} className="text-caption text-temper-700 hover:underline">
                    {s.specimenCount} specimens
                  </Link>
                </li>
              ))}
            </ul>
          )}
        </Panel>
      </div>
    </>
  );
}
