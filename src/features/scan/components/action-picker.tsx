import type { EventType } from '../../../../shared/domain/ledger/state-machine';
import { SCAN_ACTIONS } from '../actions';

/** Big buttons, one per action; the chosen one is pressed. */
export function ActionPicker({ value, onChoose }: { value: EventType | null; onChoose: (type: EventType) => void }) {
  return (
    <fieldset>
      <legend className="mb-2 text-lead font-semibold text-ink-900">What are you doing?</legend>
      <div className="grid grid-cols-2 gap-2 md:grid-cols-4">
        {SCAN_ACTIONS.map((action) => (
          <button
            key={action.type}
            type="button"
            aria-pressed={value === action.type}
            onClick={() => onChoose(action.type)}
            className="flex min-h-16 flex-col items-start justify-center rounded-md bg-white px-3 py-2 text-left ring-1 ring-ink-200 hover:ring-temper-400 aria-pressed:bg-ink-900 aria-pressed:text-white"
          >
            <span className="text-lead font-semibold">
              <span aria-hidden className="mr-1.5">{action.glyph}</span>
              {action.label}
            </span>
            <span className="text-caption opacity-80">{action.hint}</span>
          </button>
        ))}
      </div>
    </fieldset>
  );
}
