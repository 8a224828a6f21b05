import { DataTable, useServerList } from '../../components/ui/data-table';
import { PageHeader } from '../../components/ui/page-header';
import { sampleQueries } from '../../features/samples/api/queries';
import { sampleColumns } from '../../features/samples/components/columns';

/** Samples: pieces of heats received for orders. */
export function SamplesRoute() {
  const list = useServerList('-createdAt', ['orderId', 'heatId'], sampleQueries.list);
  return (
    <>
      <PageHeader title="Samples" subtitle="Pieces of a heat received for an order; specimens are cut from them." />
      <DataTable
        label="Samples"
        columns={sampleColumns}
        list={list}
        searchPlaceholder="Search by sample, heat, order or position"
        rowKey={(s) => s.id}
      />
    </>
  );
}
