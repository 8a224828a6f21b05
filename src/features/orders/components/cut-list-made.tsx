import { Link } from 'react-router-dom';
import type { CutListResult } from '../../../../shared/schemas/cut-list';
import { Mono } from '../../../components/ui/detail-list';
import { paths } from '../../../config/paths';
import { PrintLabelsLink } from '../../labels/components/print-labels-link';

/** What a cut list made: the samples and the new specimens' codes, linked. */
export function CutListMade({ result }: { result: CutListResult }) {
  return (
    <div role="status" className="rounded-md bg-good-100 p-3 text-body text-good-700">
      <p className="font-semibold">
        <span aria-hidden>● </span>
        Registered {result.specimens.length} specimen{result.specimens.length === 1 ? '' : 's'} from {result.samples.length} sample
        {result.samples.length === 1 ? '' : 's'}.
      </p>
      <ul className="mt-2 flex flex-wrap gap-2">
        {result.specimens.map((s) => (
          <li key={s.id}>
            <Link to={paths.specimen.href(s.code)} className="rounded bg-white px-2 py-0.5 text-ink-900 ring-1 ring-good-500 hover:underline">
              <Mono>{s.code}</Mono>
            </Link>
          </li>
        ))}
      </ul>
      <div className="mt-3">
        <PrintLabelsLink kind="specimen" codes={result.specimens.map((s) => s.code)} label={`Print ${result.specimens.length} specimen label${result.specimens.length === 1 ? '' : 's'}`} variant="primary" />
      </div>
    </div>
  );
}
