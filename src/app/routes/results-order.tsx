import { useQuery } from '@tanstack/react-query';
import { useParams } from 'react-router-dom';
import { paths } from '../../config/paths';
import { OrderResultsScreen } from '../../features/results/components/order-results-screen';
import { IssueReportPanel } from '../../features/reports/components/issue-report-panel';
import { specificationQueries } from '../../features/specifications/api/queries';

/** /results/orders/:id: the order's results, verdicts and signed report. */
export function ResultsOrderRoute() {
  const { id } = useParams();
  const specs = useQuery(specificationQueries.list());
  const keys = (specs.data?.items ?? []).map((s) => ({ key: s.key, name: `${s.designation} ${s.grade}` }));
  return (
    <OrderResultsScreen orderId={Number(id)} specimenHref={(code) => paths.resultsSpecimen.href(code)} specKeys={keys}>
      {(view) => <IssueReportPanel view={view} />}
    </OrderResultsScreen>
  );
}
