import { useState, type ChangeEvent } from 'react';
import { inspectCsv, RECORD_FORCE_UNITS, RECORD_LENGTH_UNITS, type CsvInspection } from '../../../../shared/domain/tensile/raw-record';
import { ApiError } from '../../../lib/api-client';
import { useUploadRecord, type RecordMapping } from '../api/save-results';

const CONTROL = 'h-10 w-full rounded-md border border-ink-300 bg-white px-3 text-body text-ink-900';

function guess(headers: readonly string[], words: readonly string[]): string {
  return headers.find((h) => words.some((w) => h.toLowerCase().includes(w))) ?? '';
}

/**
 * The raw record step: pick a CSV file, see its first rows, say which column is time, force and
 * extension, their units and the extensometer gauge length; the server checks every cell.
 * Calls `onUploaded` with the stored record's id.
 */
export function RecordUpload({ code, onUploaded }: { code: string; onUploaded: (rawRecordId: number) => void }) {
  const [csv, setCsv] = useState<string | null>(null);
  const [fileName, setFileName] = useState('');
  const [inspection, setInspection] = useState<CsvInspection | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const [mapping, setMapping] = useState<RecordMapping>({ force: '', extension: '', time: '', forceUnit: 'N', extensionUnit: 'mm', gaugeLength: '', gaugeLengthUnit: 'mm' });
  const upload = useUploadRecord(code);
  const error = upload.error instanceof ApiError ? upload.error : null;

  async function pick(e: ChangeEvent<HTMLInputElement>) {
    const file = e.target.files?.[0];
    upload.reset();
    if (!file) return;
    const text = await file.text();
    setCsv(text);
    setFileName(file.name);
    const seen = inspectCsv(text);
    if (!seen.ok) {
      setInspection(null);
      setProblem(seen.problems.map((p) => p.message).join(' '));
      return;
    }
    setProblem(null);
    setInspection(seen.value);
    const h = seen.value.headers;
    setMapping((m) => ({ ...m, force: guess(h, ['force', 'load']), extension: guess(h, ['ext', 'elong', 'strain']), time: guess(h, ['time']) }));
  }

  const set = (key: keyof RecordMapping) => (e: ChangeEvent<HTMLInputElement | HTMLSelectElement>) => setMapping((m) => ({ ...m, [key]: e.target.value }));
  const columnSelect = (key: 'force' | 'extension' | 'time', label: string, optional = false) => (
    <label className="block text-caption font-semibold text-ink-700">
      {label}
      <select className={CONTROL} value={mapping[key] ?? ''} onChange={set(key)} aria-label={`${label} column`}>
        <option value="">{optional ? '(none)' : 'Choose a column'}</option>
        {inspection?.headers.map((h) => (
          <option key={h} value={h}>
            {h}
          </option>
        ))}
      </select>
    </label>
  );

  return (
    <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="record-heading">
      <h2 id="record-heading" className="text-lead font-semibold text-ink-900">
        Raw force–extension record
      </h2>
      <label className="mt-3 block text-caption font-semibold text-ink-700">
        CSV file
        <input type="file" accept=".csv,.txt,text/csv,text/plain" onChange={(e) => void pick(e)} className="mt-1 block w-full text-body" aria-label="CSV file" />
      </label>
      {problem ? <p className="mt-2 text-body text-stop-700" role="alert">⚠ {problem}</p> : null}
      {inspection ? (
        <>
          <p className="mt-2 text-caption text-ink-500">
            {inspection.rowCount.toLocaleString('en-GB')} rows; first rows below.
          </p>
          <div className="mt-1 overflow-x-auto">
            <table className="text-caption">
              <thead>
                <tr>{inspection.headers.map((h) => <th key={h} className="px-2 text-left font-semibold">{h}</th>)}</tr>
              </thead>
              <tbody className="font-mono">
                {inspection.sampleRows.slice(0, 4).map((r, i) => (
                  <tr key={i}>{r.map((c, j) => <td key={j} className="px-2">{c}</td>)}</tr>
                ))}
              </tbody>
            </table>
          </div>
          <div className="mt-3 grid gap-3 sm:grid-cols-3">
            {columnSelect('force', 'Force')}
            {columnSelect('extension', 'Extension')}
            {columnSelect('time', 'Time (s)', true)}
            <label className="block text-caption font-semibold text-ink-700">
              Force unit
              <select className={CONTROL} value={mapping.forceUnit} onChange={set('forceUnit')}>
                {RECORD_FORCE_UNITS.map((u) => <option key={u}>{u}</option>)}
              </select>
            </label>
            <label className="block text-caption font-semibold text-ink-700">
              Extension unit
              <select className={CONTROL} value={mapping.extensionUnit} onChange={set('extensionUnit')}>
                {RECORD_LENGTH_UNITS.map((u) => <option key={u}>{u}</option>)}
              </select>
            </label>
            <div className="flex gap-2">
              <label className="block flex-1 text-caption font-semibold text-ink-700">
                Extensometer gauge length
                <input className={CONTROL} inputMode="decimal" value={mapping.gaugeLength} onChange={set('gaugeLength')} />
              </label>
              <label className="block w-20 text-caption font-semibold text-ink-700">
                Unit
                <select className={CONTROL} value={mapping.gaugeLengthUnit} onChange={set('gaugeLengthUnit')} aria-label="Gauge length unit">
                  {RECORD_LENGTH_UNITS.map((u) => <option key={u}>{u}</option>)}
                </select>
              </label>
            </div>
          </div>
          {error ? (
            <div className="mt-3 rounded-md bg-stop-100 p-3 text-body text-stop-700" role="alert">
              <p className="font-semibold">⚠ {error.message}</p>
              {error.fieldIssues().length > 1 ? (
                <ul className="mt-1 list-disc pl-5 text-caption">{error.fieldIssues().map((d, i) => <li key={i}>{d.message}</li>)}</ul>
              ) : null}
            </div>
          ) : null}
          <button
            type="button"
            className="mt-3 h-12 rounded-md bg-ink-900 px-5 text-lead font-semibold text-white disabled:bg-ink-400"
            disabled={upload.isPending || csv === null}
            onClick={() =>
              csv !== null &&
              upload.mutate({ csv, mapping: { ...mapping, fileName } }, { onSuccess: (r) => onUploaded(r.rawRecord.id) })
            }
          >
            {upload.isPending ? 'Checking the record…' : 'Use this record'}
          </button>
        </>
      ) : null}
    </section>
  );
}
