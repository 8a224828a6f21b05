import { useState } from 'react';
import type { ResultsEntry, SpecimenResultsView } from '../../../../shared/schemas/results';
import { ApiError } from '../../../lib/api-client';
import { useSaveResults } from '../api/save-results';
import { RecordUpload } from './record-upload';

const CONTROL = 'h-10 w-full rounded-md border border-ink-300 bg-white px-3 text-body text-ink-900 aria-[invalid=true]:border-stop-500';

/**
 * Entering results by hand (Fm, Lu, the final section) with an optional raw record; the values an
 * instrument posted with the tested event are offered, and L0 from the geometry or proportional.
 */
export function ResultsEntryForm({ view }: { view: SpecimenResultsView }) {
  const code = view.specimen.code;
  const instrument = view.tested?.instrument ?? {};
  const [fm, setFm] = useState(instrument.maxForceN ?? '');
  const [lu, setLu] = useState(instrument.finalGaugeLengthMm ?? '');
  const [su1, setSu1] = useState('');
  const [su2, setSu2] = useState('');
  const [basis, setBasis] = useState<'geometry' | 'proportional' | 'entered'>('geometry');
  const [l0, setL0] = useState('');
  const [recordId, setRecordId] = useState<number | null>(view.current?.inputs.rawRecord?.id ?? null);
  const save = useSaveResults(code);
  const error = save.error instanceof ApiError ? save.error : null;
  const issue = (path: string) => error?.fieldIssues().find((d) => d.path === path || d.path.startsWith(`${path}.`))?.message;

  function submit(rawRecordId: number | null = recordId) {
    const entry: ResultsEntry = { originalGaugeLength: basis === 'entered' ? { basis, valueMm: l0 } : { basis } };
    if (fm.trim()) entry.maxForceN = fm.trim();
    if (lu.trim()) entry.finalGaugeLengthMm = lu.trim();
    if (view.specimen.shape === 'round' && su1.trim()) entry.finalSection = { shape: 'round', diameterMm: su1.trim() };
    if (view.specimen.shape === 'flat' && (su1.trim() || su2.trim())) entry.finalSection = { shape: 'flat', widthMm: su1.trim(), thicknessMm: su2.trim() };
    if (rawRecordId !== null) entry.rawRecordId = rawRecordId;
    save.mutate(entry);
  }

  const field = (label: string, value: string, onChange: (v: string) => void, path: string, hint?: string) => (
    <label className="block text-caption font-semibold text-ink-700">
      {label}
      <input className={CONTROL} inputMode="decimal" value={value} onChange={(e) => onChange(e.target.value)} aria-invalid={issue(path) ? true : undefined} />
      {hint ? <span className="block font-normal text-ink-500">{hint}</span> : null}
      {issue(path) ? <span className="block text-stop-700">{issue(path)}</span> : null}
    </label>
  );

  return (
    <div className="space-y-4">
      <RecordUpload
        code={code}
        onUploaded={(id) => {
          setRecordId(id);
          submit(id);
        }}
      />
      <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="entry-heading">
        <h2 id="entry-heading" className="text-lead font-semibold text-ink-900">
          Results by hand
        </h2>
        {recordId !== null ? <p className="mt-1 text-caption text-ink-500">Computed with raw record {recordId}.</p> : null}
        <div className="mt-3 grid gap-3 sm:grid-cols-2">
          {field('Maximum force Fm (N)', fm, setFm, 'maxForceN', instrument.maxForceN ? `Posted by the instrument: ${instrument.maxForceN} N` : 'Leave empty to take the record’s peak.')}
          {field('Final gauge length Lu (mm)', lu, setLu, 'finalGaugeLengthMm')}
          {view.specimen.shape === 'round'
            ? field('Final diameter du (mm)', su1, setSu1, 'finalSection')
            : (
              <>
                {field('Final width (mm)', su1, setSu1, 'finalSection.widthMm')}
                {field('Final thickness (mm)', su2, setSu2, 'finalSection.thicknessMm')}
              </>
            )}
          <label className="block text-caption font-semibold text-ink-700">
            Original gauge length L0
            <select className={CONTROL} value={basis} onChange={(e) => setBasis(e.target.value as typeof basis)}>
              <option value="geometry">Geometry: {view.gaugeLengthOffers.geometryMm ?? '?'} mm</option>
              {view.gaugeLengthOffers.proportionalMm ? <option value="proportional">Proportional 5.65·√S0: {view.gaugeLengthOffers.proportionalMm} mm</option> : null}
              <option value="entered">Entered</option>
            </select>
          </label>
          {basis === 'entered' ? field('L0 (mm)', l0, setL0, 'originalGaugeLength') : null}
        </div>
        {error ? <p className="mt-3 rounded-md bg-stop-100 p-3 text-body text-stop-700" role="alert">⚠ {error.message}</p> : null}
        <button type="button" className="mt-3 h-12 rounded-md bg-ink-900 px-5 text-lead font-semibold text-white disabled:bg-ink-400" disabled={save.isPending} onClick={() => submit()}>
          {save.isPending ? 'Computing…' : 'Compute and save results'}
        </button>
      </section>
    </div>
  );
}
