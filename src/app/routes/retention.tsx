import { ButtonLink } from '../../components/ui/button';
import { DataTable, FilterSelect, useServerList } from '../../components/ui/data-table';
import { PageHeader } from '../../components/ui/page-header';
import { paths } from '../../config/paths';
import { retentionQueries } from '../../features/retention/api/queries';
import { dueColumns, VERDICTS } from '../../features/retention/components/due-columns';

const WITHIN = [
  { value: '0', label: 'Due now' },
  { value: '7', label: 'Within 7 days' },
  { value: '14', label: 'Within 14 days' },
  { value: '30', label: 'Within 30 days' },
  { value: '90', label: 'Within 90 days' },
];

/** /retention: every retained item with the day it may go, what stands in the way, and where it is. */
export function RetentionRoute() {
  const list = useServerList('notBefore', ['status', 'within', 'order'], retentionQueries.due);
  const { params, setParams } = list;
  const due = list.query.data;
  const counts = due?.counts;
  const dueCodes = (due?.items ?? []).filter((i) => i.status === 'may_go').map((i) => i.code);
  return (
    <>
      <PageHeader
        title="Retention"
        subtitle={due ? `Dates are days in ${due.timeZone}. An item may go from the start of the day shown.` : 'What the store keeps, and when each item may go.'}
        actions={
          <>
            <ButtonLink to={paths.holds.path}>Holds</ButtonLink>
            {due?.canWrite ? (
              <ButtonLink to={paths.disposals.href(dueCodes)} variant="primary">
                Start a disposal batch
              </ButtonLink>
            ) : null}
          </>
        }
      />
      {counts ? (
        <ul className="mb-3 flex flex-wrap gap-3 text-body" aria-label="Counts by verdict">
          {(['may_go', 'not_due', 'held'] as const).map((s) => (
            <li key={s} className="rounded-md bg-white px-3 py-1 ring-1 ring-ink-100">
              <span aria-hidden>{VERDICTS[s].glyph} </span>
              {VERDICTS[s].label}: <strong>{counts[s]}</strong>
            </li>
          ))}
        </ul>
      ) : null}
      <DataTable
        label="Due list"
        columns={dueColumns}
        list={list}
        searchPlaceholder="Search by item, order, heat, customer or place"
        rowKey={(i) => i.code}
        emptyText="No retained item matches."
        filters={
          <>
            <FilterSelect
              label="Verdict"
              value={params.filters.status}
              options={(['may_go', 'not_due', 'held'] as const).map((s) => ({ value: s, label: VERDICTS[s].label }))}
              onChange={(status) => setParams({ filters: { status } })}
            />
            <FilterSelect label="Falls due" value={params.filters.within} options={WITHIN} allLabel="Any time" onChange={(within) => setParams({ filters: { within } })} />
          </>
        }
      />
    </>
  );
}
