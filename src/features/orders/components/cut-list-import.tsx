import { useId, useRef, useState } from 'react';
import {
  CUT_LIST_MAX_BYTES,
  CUT_LIST_OPTIONAL_COLUMNS,
  CUT_LIST_REQUIRED_COLUMNS,
  CUT_LIST_TEMPLATE,
  type CutListPreview,
  type CutListResult,
} from '../../../../shared/schemas/cut-list';
import { Button, buttonClass } from '../../../components/ui/button';
import { Mono } from '../../../components/ui/detail-list';
import { FormAlert } from '../../../components/ui/form-field';
import { ApiError } from '../../../lib/api-client';
import { useImportCutList, usePreviewCutList } from '../api/cut-list';
import { CutListMade } from './cut-list-made';

function messageOf(err: unknown): string {
  return err instanceof ApiError ? err.message : 'The upload failed; try again.';
}

function downloadTemplate() {
  const url = URL.createObjectURL(new Blob([CUT_LIST_TEMPLATE], { type: 'text/csv' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = 'cut-list-template.csv';
  a.click();
  URL.revokeObjectURL(url);
}

/** Upload a cut-list CSV, see every row checked, then import all rows or none. */
export function CutListImport({ orderId }: { orderId: number }) {
  const preview = usePreviewCutList(orderId);
  const importer = useImportCutList(orderId);
  const [file, setFile] = useState<File | null>(null);
  const [checked, setChecked] = useState<CutListPreview | null>(null);
  const [done, setDone] = useState<CutListResult | null>(null);
  const [problem, setProblem] = useState<string | null>(null);
  const input = useRef<HTMLInputElement>(null);
  const id = useId();

  const onFile = async (picked: File | null) => {
    setFile(picked);
    setChecked(null);
    setDone(null);
    setProblem(null);
    if (!picked) return;
    if (picked.size > CUT_LIST_MAX_BYTES) {
      setProblem(`“${picked.name}” is larger than ${CUT_LIST_MAX_BYTES / (1024 * 1024)} MB, the most one import takes. Split it into smaller files.`);
      return;
    }
    try {
      setChecked(await preview.mutateAsync(picked));
    } catch (err) {
      setProblem(messageOf(err));
    }
  };
  const onImport = async () => {
    if (!file) return;
    setProblem(null);
    try {
      setDone(await importer.mutateAsync(file));
      setChecked(null);
      setFile(null);
      if (input.current) input.current.value = '';
    } catch (err) {
      setProblem(messageOf(err));
    }
  };
  const bad = checked ? checked.rows.length - checked.validRows : 0;

  return (
    <section aria-labelledby={`${id}-title`} className="flex flex-col gap-3 border-t border-ink-100 pt-5">
      <h3 id={`${id}-title`} className="text-body font-semibold text-ink-900">
        Import a cut list from CSV
      </h3>
      <p className="text-caption text-ink-500">
        Columns: <Mono>{CUT_LIST_REQUIRED_COLUMNS.join(', ')}</Mono>, and optionally <Mono>{CUT_LIST_OPTIONAL_COLUMNS.join(', ')}</Mono> with its unit (mm or in). One
        line per sample; at most 1 MB.{' '}
        <button type="button" onClick={downloadTemplate} className="font-semibold text-temper-700 underline">
          Download a template
        </button>
      </p>
      <div className="flex flex-wrap items-center gap-2">
        <label htmlFor={id} className={buttonClass('secondary', 'md', 'cursor-pointer')}>
          Choose CSV file
        </label>
        <input
          id={id}
          ref={input}
          type="file"
          accept=".csv,text/csv"
          className="sr-only"
          data-testid="cut-list-file"
          onChange={(e) => void onFile(e.target.files?.[0] ?? null)}
        />
        <span className="text-body text-ink-600">{file ? file.name : 'No file chosen'}</span>
        {preview.isPending ? <span className="text-caption text-ink-500">Checking every row …</span> : null}
      </div>
      <FormAlert>{problem}</FormAlert>
      {checked ? (
        <div className="flex flex-col gap-3" data-testid="cut-list-preview">
          <p role="status" className={`text-body font-semibold ${checked.ok ? 'text-good-700' : 'text-stop-700'}`}>
            <span aria-hidden>{checked.ok ? '● ' : '▲ '}</span>
            {checked.ok
              ? `All ${checked.rows.length} rows are good: ${checked.totalSpecimens} specimens from ${checked.rows.length} samples.`
              : `${bad} of ${checked.rows.length} rows have errors. Nothing will be imported until every row is right; fix the file and choose it again.`}
          </p>
          <div className="overflow-x-auto rounded-md ring-1 ring-ink-100">
            <table className="w-full min-w-[40rem] text-left text-body" aria-label="Cut-list preview">
              <thead className="bg-ink-50 text-caption uppercase text-ink-600">
                <tr>
                  <th className="px-2 py-1">Line</th>
                  <th className="px-2 py-1">Heat</th>
                  <th className="px-2 py-1">Position</th>
                  <th className="px-2 py-1">Orientation</th>
                  <th className="px-2 py-1">Specimens</th>
                  <th className="px-2 py-1">Geometry</th>
                  <th className="px-2 py-1">Thickness</th>
                  <th className="px-2 py-1">Check</th>
                </tr>
              </thead>
              <tbody>
                {checked.rows.map((r) => (
                  <tr key={r.line} className={`border-t border-ink-100 ${r.errors.length ? 'bg-stop-100/50' : ''}`}>
                    <td className="px-2 py-1 font-mono">{r.line}</td>
                    <td className="px-2 py-1 font-mono">{r.heatNumber}</td>
                    <td className="px-2 py-1">{r.position}</td>
                    <td className="px-2 py-1">{r.orientation}</td>
                    <td className="px-2 py-1">{r.specimens ?? '—'}</td>
                    <td className="px-2 py-1 font-mono text-caption">{r.geometryKey}</td>
                    <td className="px-2 py-1">{r.thicknessMm ? `${r.thicknessMm} mm` : '—'}</td>
                    <td className="px-2 py-1">
                      {r.errors.length === 0 ? (
                        <span className="text-good-700">
                          <span aria-hidden>● </span>Good
                        </span>
                      ) : (
                        <ul className="text-caption text-stop-700">
                          {r.errors.map((e) => (
                            <li key={e.column + e.message}>
                              <span aria-hidden>▲ </span>
                              <span className="font-mono">{e.column}</span>: {e.message}
                            </li>
                          ))}
                        </ul>
                      )}
                    </td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          <div>
            <Button onClick={() => void onImport()} disabled={!checked.ok} busy={importer.isPending} busyLabel="Importing …">
              Import all {checked.rows.length} rows
            </Button>
          </div>
        </div>
      ) : null}
      {done ? <CutListMade result={done} /> : null}
    </section>
  );
}
