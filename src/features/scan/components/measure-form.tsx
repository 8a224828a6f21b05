import { useState, type FormEvent } from 'react';
import {
  AREA_POLICIES,
  checkReadings,
  crossSectionArea,
  readingProblem,
  type AreaPolicy,
  type ReadingIssue,
  type Readings,
} from '../../../../shared/domain/measurement';
import { getGeometry, type SpecimenGeometry } from '../../../../shared/domain/specimen-geometries';
import type { ItemView } from '../api/types';

type Dimension = 'width' | 'thickness' | 'diameter';
const NAMES: Record<Dimension, string> = { width: 'Width', thickness: 'Thickness', diameter: 'Diameter' };
const POLICY_WORDS: Record<AreaPolicy, string> = {
  'min-dimensions': 'minimum width × minimum thickness',
  'least-section': 'least measured section',
  'mean-section': 'mean of the sections',
};

function minimum(values: string[]): string | null {
  const good = values.filter((v) => readingProblem(v) === null).map((v) => v.trim());
  if (good.length === 0) return null;
  return good.reduce((a, b) => (Number(b) < Number(a) ? b : a));
}

/**
 * Three readings per dimension, with each dimension's minimum and the area S0 worked out as they
 * are typed (under the order's area policy), each reading checked against the geometry's
 * tolerance; a reading out of tolerance is flagged and asks for a reason before recording.
 */
export function MeasureForm({
  code,
  item,
  areaPolicy,
  onRecord,
  onCancel,
}: {
  code: string;
  item: ItemView | null;
  areaPolicy: string | null;
  onRecord: (payload: Record<string, unknown>) => void;
  onCancel: () => void;
}) {
  const geometry: SpecimenGeometry | undefined = item?.specimen ? getGeometry(item.specimen.geometryKey) : undefined;
  const [shape, setShape] = useState<'flat' | 'round'>(geometry?.shape ?? (item?.specimen?.shape === 'round' ? 'round' : 'flat'));
  const policy: AreaPolicy = (AREA_POLICIES as readonly string[]).includes(areaPolicy ?? '') ? (areaPolicy as AreaPolicy) : 'min-dimensions';
  const [values, setValues] = useState<Record<Dimension, string[]>>({ width: ['', '', ''], thickness: ['', '', ''], diameter: ['', '', ''] });
  const [reason, setReason] = useState('');
  const [tried, setTried] = useState(false);
  const dims: Dimension[] = shape === 'flat' ? ['width', 'thickness'] : ['diameter'];

  const problems = dims.flatMap((d) => values[d].map((v, i) => ({ d, i, problem: v.trim() === '' ? null : readingProblem(v) })));
  const complete = dims.every((d) => values[d].every((v) => readingProblem(v) === null));
  const readings: Readings | null = complete
    ? shape === 'flat'
      ? { shape: 'flat', width: values.width, thickness: values.thickness }
      : { shape: 'round', diameter: values.diameter }
    : null;

  // Check each reading that is a number on its own, so a flag shows before all are in: blanks
  // stand in as values that always pass (the nominal size; a hair's thickness under the maximum).
  let issues: ReadingIssue[] = [];
  if (geometry && geometry.shape === shape) {
    const filled = (d: Dimension, i: number) => readingProblem(values[d][i] ?? '') === null;
    const or = (d: Dimension, stand: string) => values[d].map((v, i) => (filled(d, i) ? v.trim() : stand));
    const probe: Readings =
      geometry.shape === 'flat'
        ? { shape: 'flat', width: or('width', geometry.width.nominal), thickness: or('thickness', '0.001') }
        : { shape: 'round', diameter: or('diameter', geometry.diameter.nominal) };
    issues = checkReadings(geometry, probe).filter((x) => filled(x.dimension, x.index));
  }
  const area = readings ? crossSectionArea(readings, policy) : null;
  const needsReason = issues.length > 0;

  const submit = (e: FormEvent) => {
    e.preventDefault();
    setTried(true);
    if (!readings || (needsReason && reason.trim() === '')) return;
    onRecord({ ...readings, ...(needsReason ? { outOfToleranceReason: reason.trim() } : {}) });
  };

  return (
    <form onSubmit={submit} noValidate aria-label={`Measure ${code}`} className="flex flex-col gap-3 rounded-card bg-white p-4 ring-1 ring-ink-200" data-testid="measure-form">
      <div>
        <h2 className="text-title">Measure <span className="font-mono">{code}</span></h2>
        <p className="text-body text-ink-600">
          {geometry ? `${geometry.label} · ${geometry.standard}` : 'Geometry not known here: the readings are checked when they reach the ledger.'}
        </p>
      </div>
      {!geometry ? (
        <div className="flex gap-2" role="radiogroup" aria-label="Shape">
          {(['flat', 'round'] as const).map((s) => (
            <button key={s} type="button" role="radio" aria-checked={shape === s} onClick={() => setShape(s)} className="h-12 flex-1 rounded-md ring-1 ring-ink-300 aria-checked:bg-ink-900 aria-checked:text-white">
              {s === 'flat' ? 'Flat' : 'Round'}
            </button>
          ))}
        </div>
      ) : null}
      {dims.map((d) => {
        const min = minimum(values[d]);
        return (
          <fieldset key={d} className="flex flex-col gap-1">
            <legend className="text-body font-semibold">{NAMES[d]}, mm (three readings)</legend>
            <div className="grid grid-cols-3 gap-2">
              {values[d].map((v, i) => {
                const problem = problems.find((p) => p.d === d && p.i === i)?.problem ?? null;
                const flagged = issues.find((x) => x.dimension === d && x.index === i);
                return (
                  <label key={i} className="flex flex-col">
                    <span className="sr-only">{`${NAMES[d]} ${i + 1}`}</span>
                    <input
                      aria-label={`${NAMES[d]} ${i + 1}`}
                      inputMode="decimal"
                      autoComplete="off"
                      value={v}
                      aria-invalid={problem || flagged ? true : undefined}
                      onChange={(e) => setValues((old) => ({ ...old, [d]: old[d].map((x, j) => (j === i ? e.target.value : x)) }))}
                      className={`h-14 w-full rounded-md border px-2 text-center font-mono text-lead ${problem || flagged ? 'border-stop-500 border-2' : 'border-ink-300'}`}
                    />
                    {problem ? <span className="text-caption text-stop-700">▲ {problem}</span> : null}
                    {flagged ? <span className="text-caption font-semibold text-stop-700" data-testid="tolerance-flag">▲ {flagged.status === 'below' ? 'Below' : 'Above'} {flagged.allowed}</span> : null}
                  </label>
                );
              })}
            </div>
            <p className="text-body" data-testid={`min-${d}`}>
              Minimum: <span className="font-mono font-semibold">{min ?? '—'}</span>
            </p>
          </fieldset>
        );
      })}
      <p className="rounded-md bg-ink-50 px-3 py-2 text-lead" data-testid="area">
        Area S₀: <span className="font-mono font-semibold">{area ? `${area.area} mm²` : '—'}</span>
        <span className="block text-caption text-ink-600">Policy: {POLICY_WORDS[policy]}{area ? ` · ${area.basis}` : ''}</span>
      </p>
      {needsReason ? (
        <label className="flex flex-col gap-1">
          <span className="text-body font-semibold text-stop-700">▲ A reading is out of tolerance. Measure again, or say why the specimen is used as it is:</span>
          <textarea value={reason} onChange={(e) => setReason(e.target.value)} rows={2} aria-label="Reason for out-of-tolerance readings" className="rounded-md border border-ink-300 p-2 text-body" />
          {tried && reason.trim() === '' ? <span role="alert" className="text-caption font-semibold text-stop-700">Give a reason, or correct the reading.</span> : null}
        </label>
      ) : null}
      {tried && !readings ? <p role="alert" className="text-body font-semibold text-stop-700">▲ Enter all readings as numbers of millimetres.</p> : null}
      <div className="flex gap-2">
        <button type="submit" className="h-14 flex-1 rounded-md bg-ink-900 text-lead font-semibold text-white">Record measurement</button>
        <button type="button" onClick={onCancel} className="h-14 rounded-md px-4 text-lead ring-1 ring-ink-300">Cancel</button>
      </div>
    </form>
  );
}
