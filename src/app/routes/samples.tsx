import { useQuery } from '@tanstack/react-query';
import { DataTable, listQueryOf, useListParams } from '../../components/ui/data-table';
import { PageHeader } from '../../components/ui/page-header';
import { sampleQueries } from '../../features/samples/api/queries';
import { sampleColumns } from '../../features/samples/components/columns';

/** Samples: pieces of heats received for orders. */
export function SamplesRoute() {
  const [params, setParams] = useListParams('-createdAt', ['orderId', 'heatId']);
  const list = useQuery(sampleQueries.list(listQueryOf(params)));
  return (
    <>
      <PageHeader title="Samples" subtitle="Pieces of a heat received for an order; specimens are cut from them." />
      <DataTable
        label="Samples"
        columns={sampleColumns}
        data={list.data}
        isFetching={list.isFetching}
        isStale={list.isPlaceholderData}
        error={list.error}
        params={params}
        onParams={setParams}
        searchPlaceholder="Search by sample, heat, order or position"
        rowKey={(s) => s.id}
      />
    </>
  );
}
