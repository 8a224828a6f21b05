import { useQuery } from '@tanstack/react-query';
import { Link } from 'react-router-dom';
import { PROPERTY_SYMBOL, TENSILE_PROPERTIES } from '../../../../shared/domain/tensile/compute';
import { PageHeader } from '../../../components/ui/page-header';
import { StateBadge } from '../../../components/ui/state-badge';
import { resultsQueries } from '../api/queries';
import { ResultsEntryForm } from './results-entry';
import { StressStrainChart } from './stress-strain-chart';
import { VerdictBadge } from './verdict-badge';

/** One specimen's results: inputs, values, chart, verdict against the order's specification, and entry. */
export function SpecimenResultsScreen({ code, orderHref }: { code: string; orderHref: (orderId: number) => string }) {
  const { data: view, error, isPending } = useQuery(resultsQueries.specimen(code));
  if (isPending) return <p className="text-body text-ink-500">Loading results…</p>;
  if (error || !view) return <p className="text-body text-stop-700" role="alert">⚠ {error?.message ?? 'The results could not be loaded.'}</p>;
  const { specimen, current } = view;
  return (
    <div className="space-y-5">
      <PageHeader
        title={`Results of ${specimen.code}`}
        subtitle={
          <span className="flex flex-wrap items-center gap-2">
            <StateBadge state={specimen.state} /> Heat <span className="font-mono">{specimen.heatNumber}</span> · Order{' '}
            <Link className="font-mono underline" to={orderHref(specimen.orderId)}>
              {specimen.orderNumber}
            </Link>{' '}
            · {specimen.geometryLabel ?? specimen.geometryKey}
          </span>
        }
      />
      <section className="grid gap-3 rounded-lg border border-ink-200 bg-white p-4 text-body sm:grid-cols-2">
        <div>
          <h2 className="text-caption font-semibold text-ink-500">Cross-section S0</h2>
          {view.measurement ? (
            <p>
              <span className="font-mono">{view.measurement.s0Mm2} mm²</span> — {view.measurement.basis}
            </p>
          ) : (
            <p className="text-stop-700">⚠ Never measured: results need the measured S0.</p>
          )}
        </div>
        <div>
          <h2 className="text-caption font-semibold text-ink-500">Judged against</h2>
          {view.specification.status === 'found' ? <p>{view.specification.name}</p> : <p className="text-warn-700">⚠ {view.specification.reason}</p>}
        </div>
      </section>

      {current ? (
        <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="values-heading">
          <div className="flex flex-wrap items-center justify-between gap-2">
            <h2 id="values-heading" className="text-lead font-semibold text-ink-900">
              Results
            </h2>
            <span className="flex items-center gap-2 text-body" data-testid="specimen-verdict">
              Verdict <VerdictBadge verdict={view.verdict?.verdict ?? null} />
            </span>
          </div>
          <table className="mt-2 w-full text-body">
            <tbody>
              {TENSILE_PROPERTIES.map((p) => {
                const r = current.results.properties[p];
                return (
                  <tr key={p} className="border-t border-ink-100">
                    <th className="w-24 py-1.5 text-left font-semibold">{PROPERTY_SYMBOL[p]}</th>
                    <td className="py-1.5 font-mono" data-property={p}>
                      {r.status === 'determined' ? `${r.value} ${r.unit}` : '—'}
                      {current.ksi[p] ? <span className="ml-2 text-ink-500">({current.ksi[p]})</span> : null}
                    </td>
                    <td className="py-1.5 text-caption text-ink-500">{r.status === 'determined' ? r.basis : r.reason}</td>
                  </tr>
                );
              })}
            </tbody>
          </table>
          {view.verdict ? (
            <ul className="mt-3 space-y-1 text-body">
              {view.verdict.properties.map((p) => (
                <li key={p.property} className="flex flex-wrap items-center gap-2">
                  <VerdictBadge verdict={p.verdict} /> {p.message}
                </li>
              ))}
            </ul>
          ) : null}
          {current.results.warnings.map((w) => (
            <p key={w.code} className="mt-2 text-body text-warn-700">
              ⚠ {w.message}
            </p>
          ))}
          <p className="mt-2 text-caption text-ink-500">
            Computed {new Date(current.createdAt).toLocaleString('en-GB')} by {current.enteredBy}; rounding {current.results.rounding.strength} MPa, A {current.results.rounding.elongation} %, Z{' '}
            {current.results.rounding.reductionOfArea} % (ASTM E29 for exact halves). {view.history.length > 1 ? `${view.history.length} computations kept.` : ''}
          </p>
        </section>
      ) : (
        <p className="text-body text-ink-500">No results yet.</p>
      )}
      {view.chart ? <StressStrainChart chart={view.chart} /> : null}
      {view.canWrite ? <ResultsEntryForm key={current?.id ?? 0} view={view} /> : null}
    </div>
  );
}
