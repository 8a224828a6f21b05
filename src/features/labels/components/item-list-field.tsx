import { useId } from 'react';
import type { CodeLine } from '../code-lines';

/**
 * The items to label: a box to paste a list into or scan into (a scanner's Enter starts a new
 * line), with every line checked as it is typed, and the server's word on any code beside it.
 */
export function ItemListField({
  value,
  onChange,
  lines,
  serverNotes,
  placeholder,
}: {
  value: string;
  onChange: (value: string) => void;
  lines: readonly CodeLine[];
  /** Messages from the server keyed by code (unknown, printed before, wrong state). */
  serverNotes: ReadonlyMap<string, string>;
  placeholder: string;
}) {
  const id = useId();
  const good = lines.filter((l) => l.kind === 'good').length;
  const bad = lines.filter((l) => l.kind === 'problem').length;
  return (
    <div className="flex flex-col gap-1">
      <label htmlFor={id} className="text-body font-semibold text-ink-800">
        Items
      </label>
      <textarea
        id={id}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        autoCapitalize="characters"
        autoComplete="off"
        spellCheck={false}
        rows={5}
        placeholder={placeholder}
        aria-describedby={`${id}-summary`}
        aria-invalid={bad > 0 || undefined}
        className={`min-h-32 w-full rounded-md border bg-white px-3 py-2 font-mono text-body uppercase tracking-wide text-ink-900 placeholder:normal-case placeholder:tracking-normal placeholder:text-ink-400 ${bad > 0 ? 'border-stop-500 ring-1 ring-stop-500' : 'border-ink-300'}`}
        data-testid="label-codes"
      />
      <p id={`${id}-summary`} aria-live="polite" className="text-caption text-ink-500">
        Scan or paste codes, one per line. {good} ready{bad > 0 ? `, ${bad} to fix` : ''}.
      </p>
      {lines.length > 0 ? (
        <ul className="mt-1 flex max-h-64 flex-col gap-1 overflow-y-auto" data-testid="label-code-lines">
          {lines.map((line, i) => {
            const note = line.kind === 'good' ? serverNotes.get(line.code) : undefined;
            const problem = line.kind === 'problem' ? line.message : note;
            return (
              <li
                // The same code may be listed twice on purpose (two labels), so the index is part of the key.
                key={`${i}-${line.text}`}
                className={`flex flex-col rounded-md px-2 py-1 text-caption ${problem ? 'bg-stop-100 text-stop-700' : line.kind === 'good' ? 'bg-good-100 text-good-700' : 'bg-ink-50 text-ink-600'}`}
              >
                <span className="font-semibold">
                  <span aria-hidden>{problem ? '▲ ' : line.kind === 'good' ? '● ' : '○ '}</span>
                  <span className="font-mono">{line.kind === 'good' ? line.code : line.text}</span>
                  {line.kind === 'good' && !problem ? <span className="font-sans font-normal"> · check character good</span> : null}
                  {line.kind === 'typing' ? <span className="font-sans font-normal"> · still typing</span> : null}
                </span>
                {problem ? <span>{problem}</span> : null}
              </li>
            );
          })}
        </ul>
      ) : null}
    </div>
  );
}
