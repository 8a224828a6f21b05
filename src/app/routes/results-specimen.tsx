import { useParams } from 'react-router-dom';
import { paths } from '../../config/paths';
import { SpecimenResultsScreen } from '../../features/results/components/specimen-results-screen';

/** /results/specimens/:code: one specimen's results, chart, verdict and entry. */
export function ResultsSpecimenRoute() {
  const { code = '' } = useParams();
  return <SpecimenResultsScreen code={code} orderHref={(id) => paths.resultsOrder.href(id)} />;
}
