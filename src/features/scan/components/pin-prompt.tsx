import { useState, type FormEvent } from 'react';
import type { StationOperatorResponse } from '../../../../shared/schemas/scan';
import { call } from '../api/http';

/**
 * Switching the operator at a shared station: the badge was scanned; its holder types their PIN.
 * Both are needed, so a found badge alone records nothing in anyone's name.
 */
export function PinPrompt({
  badge,
  holder,
  onDone,
  onCancel,
}: {
  badge: string;
  holder: string | null;
  onDone: (answer: StationOperatorResponse) => void;
  onCancel: () => void;
}) {
  const [pin, setPin] = useState('');
  const [error, setError] = useState<string | null>(null);
  const [busy, setBusy] = useState(false);
  const submit = async (e: FormEvent) => {
    e.preventDefault();
    setBusy(true);
    const answer = await call<StationOperatorResponse>('/auth/station-operator', { json: { badgeCode: badge, pin } });
    setBusy(false);
    setPin('');
    if (answer.ok) onDone(answer.body);
    else setError(answer.status === 0 ? 'No connection: switching operator needs the server. Try again when online.' : answer.error.message);
  };
  return (
    <form onSubmit={submit} aria-label="Switch operator" className="flex flex-col gap-3 rounded-card bg-white p-4 ring-1 ring-ink-200" data-testid="pin-prompt">
      <h2 className="text-title">Switch operator</h2>
      <p className="text-body">
        Badge <span className="font-mono font-semibold">{badge}</span>
        {holder ? ` · ${holder}` : ''}. Type your PIN to record scans in your name.
      </p>
      <label className="flex flex-col gap-1">
        <span className="text-body font-semibold">PIN</span>
        <input
          type="password"
          inputMode="numeric"
          autoComplete="off"
          autoFocus
          value={pin}
          onChange={(e) => setPin(e.target.value.replace(/\D/g, '').slice(0, 8))}
          className="h-14 rounded-md border border-ink-300 px-3 text-center font-mono text-display tracking-[0.5em]"
        />
      </label>
      {error ? (
        <p role="alert" className="rounded-md bg-stop-100 px-3 py-2 text-body text-stop-700">
          <span aria-hidden>▲ </span>
          {error}
        </p>
      ) : null}
      <div className="flex gap-2">
        <button type="submit" disabled={busy || pin.length < 4} className="h-14 flex-1 rounded-md bg-ink-900 text-lead font-semibold text-white disabled:opacity-50">
          Switch
        </button>
        <button type="button" onClick={onCancel} className="h-14 rounded-md px-4 text-lead ring-1 ring-ink-300">
          Cancel
        </button>
      </div>
    </form>
  );
}
