import { useNavigate } from 'react-router-dom';
import type { SpecimenView } from '../../../shared/schemas/specimens';
import { CodeField } from '../../components/ui/code-field';
import { DataTable, FilterSelect, useServerList } from '../../components/ui/data-table';
import { Panel } from '../../components/ui/detail-list';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { specimenQueries } from '../../features/specimens/api/queries';
import { SPECIMEN_STATE_OPTIONS, specimenColumns } from '../../features/specimens/components/columns';
import { LabelSelectionBar, selectionColumn, useCanPrintLabels, useLabelSelection } from '../../features/labels/components/label-selection';

const SHAPES = [
  { value: 'flat', label: 'Flat' },
  { value: 'round', label: 'Round' },
];

/** Specimens: every machined piece, with its code and where it stands. */
export function SpecimensRoute() {
  const list = useServerList('-code', ['state', 'shape', 'orderId', 'heatId', 'sampleId'], specimenQueries.list);
  const { params, setParams } = list;
  const navigate = useNavigate();
  // Ticked specimens go to the labels page together; the ticks survive paging and searching.
  const selection = useLabelSelection();
  const canPrint = useCanPrintLabels();
  const pageCodes = (list.query.data?.items ?? []).map((s) => s.code);
  const columns = canPrint ? [selectionColumn(selection, (s: SpecimenView) => s.code, pageCodes), ...specimenColumns] : specimenColumns;
  const scoped = params.filters.orderId || params.filters.heatId || params.filters.sampleId;
  return (
    <>
      <PageHeader title="Specimens" subtitle="Every specimen by its code, with its heat, order and state." />
      <Panel className="mb-5">
        <CodeField label="Open a specimen by its code" kinds={['specimen']} onCode={(c) => navigate(paths.specimen.href(c.code))} />
      </Panel>
      {scoped ? (
        <p className="mb-3 text-body text-ink-600">
          Showing one {params.filters.sampleId ? 'sample' : params.filters.heatId ? 'heat' : 'order'}’s specimens.{' '}
          <button type="button" className="font-semibold text-temper-700 underline" onClick={() => setParams({ filters: { orderId: undefined, heatId: undefined, sampleId: undefined } })}>
            Show all
          </button>
        </p>
      ) : null}
      <LabelSelectionBar kind="specimen" selection={selection} />
      <DataTable
        label="Specimens"
        columns={columns}
        list={list}
        searchPlaceholder="Search by code, heat, order or sample"
        rowKey={(s) => s.id}
        filters={
          <>
            <FilterSelect label="State" value={params.filters.state} options={SPECIMEN_STATE_OPTIONS} onChange={(state) => setParams({ filters: { state } })} />
            <FilterSelect label="Shape" value={params.filters.shape} options={SHAPES} onChange={(shape) => setParams({ filters: { shape } })} />
          </>
        }
      />
    </>
  );
}
