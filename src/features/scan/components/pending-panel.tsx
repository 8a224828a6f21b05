import type { QueuedScan } from '../queue';
import type { SyncReport } from '../sync';
import { OutcomeMark } from './outcome-mark';

/** Scans kept on this device, a button to send them now, and the report of the last sync. */
export function PendingPanel({
  pending,
  report,
  online,
  syncing,
  onSync,
  onDismiss,
}: {
  pending: QueuedScan[];
  report: SyncReport | null;
  online: boolean;
  syncing: boolean;
  onSync: () => void;
  onDismiss: () => void;
}) {
  return (
    <section aria-label="Kept on this device" className="flex flex-col gap-3 rounded-card bg-white p-4 ring-1 ring-ink-200" data-testid="pending-panel">
      <div className="flex items-center justify-between gap-2">
        <h2 className="text-lead font-semibold">
          Waiting to sync: <span data-testid="pending-count">{pending.length}</span>
        </h2>
        <button type="button" onClick={onSync} disabled={syncing || pending.length === 0 || !online} className="h-12 rounded-md bg-ink-900 px-4 text-body font-semibold text-white disabled:opacity-40">
          {syncing ? 'Syncing …' : 'Sync now'}
        </button>
      </div>
      {pending.length > 0 ? (
        <ul className="flex max-h-60 flex-col gap-1 overflow-auto" data-testid="pending-list">
          {pending.map((scan) => (
            <li key={scan.key} className="flex items-center gap-2 text-body">
              <span className="text-straw-700"><OutcomeMark outcome="kept" size={18} /></span>
              <span className="font-mono">{scan.event.itemCode}</span>
              <span>{scan.label}</span>
              <span className="ml-auto text-caption text-ink-500">{new Date(scan.event.occurredAt).toLocaleTimeString()}</span>
              {scan.operatorName ? <span className="text-caption text-ink-500">· {scan.operatorName}</span> : null}
            </li>
          ))}
        </ul>
      ) : null}
      {pending.some((s) => s.lastProblem) ? <p className="text-caption text-stop-700">▲ {pending.find((s) => s.lastProblem)?.lastProblem}</p> : null}
      {report ? (
        <div role="status" className="rounded-md bg-ink-50 p-3 text-body" data-testid="sync-report">
          <p className="font-semibold">
            Sync report: {report.recorded} recorded, {report.replayed} already there, {report.refused.length} refused
            {report.stillKept > 0 ? `, ${report.stillKept} still waiting` : ''}.
          </p>
          {report.problem ? <p className="mt-1 text-stop-700">▲ {report.problem}</p> : null}
          {report.refused.length > 0 ? (
            <ul className="mt-2 flex flex-col gap-1" data-testid="sync-refused">
              {report.refused.map((r) => (
                <li key={r.scan.key} className="flex items-start gap-2">
                  <span className="text-stop-700"><OutcomeMark outcome="refused" size={18} /></span>
                  <span>
                    <span className="font-mono font-semibold">{r.scan.event.itemCode}</span> · {r.scan.label}: {r.message}
                  </span>
                </li>
              ))}
            </ul>
          ) : null}
          <button type="button" onClick={onDismiss} className="mt-2 text-caption underline">Dismiss</button>
        </div>
      ) : null}
    </section>
  );
}
