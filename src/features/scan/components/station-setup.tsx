import { useState, type FormEvent } from 'react';
import { isEventType } from '../../../../shared/domain/ledger/state-machine';
import { SCAN_ACTIONS } from '../actions';
import type { FixedStation } from '../station';

/** Sets this device up as a fixed station: one station code and one action, remembered here. */
export function StationSetup({ onSave }: { onSave: (station: FixedStation) => void }) {
  const [code, setCode] = useState('');
  const [action, setAction] = useState<string>(SCAN_ACTIONS[0]?.type ?? 'cut');
  const submit = (e: FormEvent) => {
    e.preventDefault();
    if (code.trim() === '' || !isEventType(action)) return;
    onSave({ stationCode: code.trim().toUpperCase(), action });
  };
  return (
    <details className="rounded-card bg-white p-4 ring-1 ring-ink-200">
      <summary className="cursor-pointer text-lead font-semibold">Set up a fixed station</summary>
      <form onSubmit={submit} className="mt-3 flex flex-col gap-3" aria-label="Fixed station">
        <p className="text-body text-ink-600">A tablet at the saw or the frame can always do one action at one station; this device remembers it.</p>
        <label className="flex flex-col gap-1">
          <span className="text-body font-semibold">Station code</span>
          <input value={code} onChange={(e) => setCode(e.target.value)} autoComplete="off" className="h-12 rounded-md border border-ink-300 px-3 font-mono uppercase" />
        </label>
        <label className="flex flex-col gap-1">
          <span className="text-body font-semibold">Action</span>
          <select value={action} onChange={(e) => setAction(e.target.value)} className="h-12 rounded-md border border-ink-300 px-3">
            {SCAN_ACTIONS.map((a) => (
              <option key={a.type} value={a.type}>{a.label}</option>
            ))}
          </select>
        </label>
        <button type="submit" className="h-12 rounded-md bg-ink-900 text-body font-semibold text-white">Use this station</button>
      </form>
    </details>
  );
}
