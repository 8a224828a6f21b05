import { SAFETY_TEXT, type SafetyNote as Note } from '../actions';

/** The usual caution beside saw and frame actions; the lab's own procedures govern the machines. */
export function SafetyNote({ note }: { note: Note }) {
  return (
    <p role="note" className="flex items-start gap-2 rounded-md bg-warn-100 px-3 py-2 text-body text-warn-700 ring-1 ring-inset ring-warn-500" data-testid="safety-note">
      <svg width="18" height="18" viewBox="0 0 10 10" aria-hidden className="mt-0.5 shrink-0">
        <path d="M5 0.6 9.6 9.2H0.4Z" fill="currentColor" />
      </svg>
      <span>
        <span className="font-semibold">Caution. </span>
        {SAFETY_TEXT[note]}
      </span>
    </p>
  );
}
