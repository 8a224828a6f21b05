import { useId, useState } from 'react';
import { describeCodePattern, parseCode, type CodeKind, type ParsedCodeOk } from '../../../shared/domain/codes';

/**
 * A typed-entry field for a Halfmark code that checks as you type: it flags a wrong check
 * character or a malformed code at once, and hands the code on only when it is good.
 *
 * @param kinds - The code kinds this field accepts.
 * @param onCode - Called with the parsed code when the person submits a good one.
 */
export function CodeField({
  label,
  kinds,
  onCode,
  submitLabel = 'Open',
  busy = false,
  serverError,
}: {
  label: string;
  kinds: readonly CodeKind[];
  onCode: (code: ParsedCodeOk) => void;
  submitLabel?: string;
  busy?: boolean;
  serverError?: string | null;
}) {
  const [text, setText] = useState('');
  const id = useId();
  const parsed = text.trim() === '' ? null : parseCode(text);
  const wrongKind = parsed?.ok && !kinds.includes(parsed.kind) ? `${parsed.code} is a ${parsed.kind} code; this field takes a ${kinds.join(' or ')} code.` : null;
  // Flag only once the code could be complete, so typing the first characters is not an error.
  const complete = text.replace(/[\s-]/g, '').length >= 8;
  const problem = parsed && !parsed.ok && (parsed.reason === 'check' || complete) ? parsed.message : wrongKind;
  const good = parsed?.ok && !wrongKind ? parsed : null;
  const message = problem ?? serverError ?? null;
  return (
    <form
      className="flex flex-col gap-1"
      onSubmit={(e) => {
        e.preventDefault();
        if (good) onCode(good);
      }}
    >
      <label htmlFor={id} className="text-body font-semibold text-ink-800">
        {label}
      </label>
      <div className="flex gap-2">
        <input
          id={id}
          value={text}
          onChange={(e) => setText(e.target.value)}
          autoCapitalize="characters"
          autoComplete="off"
          spellCheck={false}
          inputMode="text"
          placeholder={describeCodePattern(kinds[0] ?? 'specimen').replace(/^.*such as /, '').replace(/\.$/, '')}
          aria-invalid={problem ? true : undefined}
          aria-describedby={`${id}-status`}
          className={`h-12 min-w-0 flex-1 rounded-md border px-3 font-mono text-lead uppercase tracking-wide ${problem ? 'border-stop-500 ring-1 ring-stop-500' : good ? 'border-good-500' : 'border-ink-300'}`}
        />
        <button type="submit" disabled={!good || busy} className="h-12 rounded-md bg-ink-900 px-4 font-semibold text-white disabled:bg-ink-400">
          {submitLabel}
        </button>
      </div>
      <p id={`${id}-status`} aria-live="polite" className={`min-h-5 text-caption font-semibold ${message ? 'text-stop-700' : 'text-good-700'}`} data-testid="code-status">
        {message ? (
          <>
            <span aria-hidden>▲ </span>
            {message}
          </>
        ) : good ? (
          <>
            <span aria-hidden>● </span>Check character good: {good.code}
          </>
        ) : null}
      </p>
    </form>
  );
}
