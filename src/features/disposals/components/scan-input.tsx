import { useId, useRef, useState } from 'react';
import { parseCode } from '../../../../shared/domain/codes';

/**
 * A field a hand scanner types into: each code ends with Enter and is handed on at once, and the
 * field clears for the next one. A code whose check character fails is refused here.
 */
export function ScanInput({ label, onScan, error }: { label: string; onScan: (code: string) => string | null; error?: string | null }) {
  const [text, setText] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const id = useId();
  const input = useRef<HTMLInputElement>(null);
  const message = problem ?? error ?? null;
  return (
    <form
      className="flex flex-col gap-1"
      onSubmit={(e) => {
        e.preventDefault();
        const parsed = parseCode(text);
        if (!parsed.ok) {
          setProblem(parsed.message);
          return;
        }
        setProblem(onScan(parsed.code));
        setText('');
        input.current?.focus();
      }}
    >
      <label htmlFor={id} className="text-body font-semibold text-ink-800">
        {label}
      </label>
      <div className="flex gap-2">
        <input
          ref={input}
          id={id}
          value={text}
          onChange={(e) => {
            setText(e.target.value);
            setProblem(null);
          }}
          autoCapitalize="characters"
          autoComplete="off"
          spellCheck={false}
          aria-invalid={message ? true : undefined}
          aria-describedby={`${id}-msg`}
          className="h-12 min-w-0 flex-1 rounded-md border border-ink-300 px-3 font-mono text-lead uppercase tracking-wide"
        />
        <button type="submit" className="h-12 rounded-md bg-ink-900 px-5 font-semibold text-white">
          Add
        </button>
      </div>
      <p id={`${id}-msg`} role={message ? 'alert' : undefined} className="min-h-5 text-caption font-semibold text-stop-700">
        {message ? (
          <>
            <span aria-hidden>▲ </span>
            {message}
          </>
        ) : null}
      </p>
    </form>
  );
}
