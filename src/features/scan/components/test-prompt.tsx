import { SafetyNote } from './safety-note';

/** After a test: did the specimen break? Two large answers; a break makes half A and half B. */
export function TestPrompt({ code, onAnswer, onCancel }: { code: string; onAnswer: (fractured: boolean) => void; onCancel: () => void }) {
  return (
    <section aria-label={`Test result for ${code}`} className="flex flex-col gap-3 rounded-card bg-white p-4 ring-1 ring-ink-200" data-testid="test-prompt">
      <h2 className="text-title">
        Did <span className="font-mono">{code}</span> break?
      </h2>
      <SafetyNote note="frame" />
      <div className="grid grid-cols-2 gap-2">
        <button type="button" onClick={() => onAnswer(true)} className="flex h-20 flex-col items-center justify-center rounded-md bg-ink-900 text-lead font-semibold text-white">
          <span aria-hidden>⚡</span>Broken in two
        </button>
        <button type="button" onClick={() => onAnswer(false)} className="flex h-20 flex-col items-center justify-center rounded-md text-lead font-semibold ring-2 ring-ink-900">
          <span aria-hidden>▬</span>Unbroken
        </button>
      </div>
      <button type="button" onClick={onCancel} className="h-12 rounded-md text-body ring-1 ring-ink-300">
        Cancel
      </button>
    </section>
  );
}
