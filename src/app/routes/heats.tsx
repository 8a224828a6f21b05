import { useState } from 'react';
import { useNavigate } from 'react-router-dom';
import { Button } from '../../components/ui/button';
import { DataTable, useServerList } from '../../components/ui/data-table';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { heatQueries } from '../../features/heats/api/queries';
import { useSaveHeat } from '../../features/heats/api/save-heat';
import { heatColumns } from '../../features/heats/components/columns';
import { HeatForm } from '../../features/heats/components/heat-form';

/** Heats and lots: the melts samples come from. */
export function HeatsRoute() {
  const list = useServerList('-createdAt', ['orderId'], heatQueries.list);
  const [adding, setAdding] = useState(false);
  const save = useSaveHeat();
  const navigate = useNavigate();
  return (
    <>
      <PageHeader
        title="Heats"
        subtitle="Each melt or lot, by its producer’s number."
        actions={list.query.data?.canWrite && !adding ? <Button onClick={() => setAdding(true)}>Register a heat</Button> : null}
      />
      {adding ? (
        <Panel title="New heat" className="mb-5">
          <HeatForm save={save.mutateAsync} submitLabel="Register heat" onSaved={(h) => navigate(paths.heat.href(h.id))} onCancel={() => setAdding(false)} />
        </Panel>
      ) : null}
      <DataTable
        label="Heats"
        columns={heatColumns}
        list={list}
        searchPlaceholder="Search by number, grade, producer or certificate"
        rowKey={(h) => h.id}
      />
    </>
  );
}
