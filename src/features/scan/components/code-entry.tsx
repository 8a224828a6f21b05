import { useState, type FormEvent } from 'react';
import { normalizeCode, parseCode } from '../../../../shared/domain/codes';

/** What the typed text says so far: nothing yet, still short, a good code, or why not. */
function liveCheck(text: string): { tone: 'idle' | 'good' | 'bad'; words: string } {
  if (normalizeCode(text) === '') return { tone: 'idle', words: 'The last character is a check: a typing slip shows at once.' };
  const parsed = parseCode(text);
  if (parsed.ok) return { tone: 'good', words: `Check character matches: ${parsed.kind} ${parsed.code}` };
  if (parsed.reason === 'check') return { tone: 'bad', words: parsed.message };
  return { tone: 'idle', words: parsed.message };
}

/** Typed entry: the code is checked by its check character as it is typed; Enter or the button records it. */
export function CodeEntry({ onCode, disabled }: { onCode: (code: string) => void; disabled?: boolean }) {
  const [text, setText] = useState('');
  const check = liveCheck(text);
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (normalizeCode(text) === '') return;
    onCode(text);
    setText('');
  };
  return (
    <form onSubmit={submit} className="flex flex-col gap-1" aria-label="Typed entry">
      <label htmlFor="typed-code" className="text-body font-semibold text-ink-800">
        Type a code
      </label>
      <div className="flex gap-2">
        <input
          id="typed-code"
          value={text}
          onChange={(e) => setText(e.target.value)}
          autoComplete="off"
          autoCapitalize="characters"
          spellCheck={false}
          inputMode="text"
          placeholder="S26-00157-W"
          aria-invalid={check.tone === 'bad' ? true : undefined}
          aria-describedby="typed-code-check"
          className="h-14 min-w-0 flex-1 rounded-md border border-ink-300 px-3 font-mono text-lead uppercase"
        />
        <button type="submit" disabled={disabled} className="h-14 rounded-md bg-ink-900 px-5 text-lead font-semibold text-white disabled:opacity-50">
          Record
        </button>
      </div>
      <p
        id="typed-code-check"
        data-testid="typed-code-check"
        data-tone={check.tone}
        className={`text-caption ${check.tone === 'bad' ? 'font-semibold text-stop-700' : check.tone === 'good' ? 'font-semibold text-good-700' : 'text-ink-500'}`}
      >
        {check.tone === 'good' ? <span aria-hidden>✓ </span> : check.tone === 'bad' ? <span aria-hidden>▲ </span> : null}
        {check.words}
      </p>
    </form>
  );
}
