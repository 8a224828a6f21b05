/**
 * Sending kept scans to the ledger through POST /api/events/batch, grouped by the operator they
 * belong to, and saying what happened to each.
 */
import { parseCode } from '../../../shared/domain/codes';
import { MAX_BATCH_EVENTS } from '../../../shared/schemas/events';
import { call } from './api/http';
import type { BatchAnswer } from './api/types';
import { forgetScan, markScan, pendingScans, type QueuedScan } from './queue';
import { resultOfAnswer } from './results';

/** A scan the ledger refused while syncing, with its reason. */
export interface SyncRefusal {
  scan: QueuedScan;
  status: number;
  message: string;
}

/** What one sync did. */
export interface SyncReport {
  at: string;
  sent: number;
  recorded: number;
  replayed: number;
  refused: SyncRefusal[];
  /** Scans still on the device, and why they could not go. */
  stillKept: number;
  problem: string | null;
}

/** Keys of scans being sent right now by the live scanner, which a sync leaves alone. */
export const inFlight = new Set<string>();

let running: Promise<SyncReport> | null = null;

async function sendGroup(scans: QueuedScan[], token: string | null, report: SyncReport): Promise<boolean> {
  for (let start = 0; start < scans.length; start += MAX_BATCH_EVENTS) {
    const chunk = scans.slice(start, start + MAX_BATCH_EVENTS);
    const answer = await call<BatchAnswer>('/events/batch', { json: { events: chunk.map((s) => s.event) }, operatorToken: token });
    if (!answer.ok) {
      const problem =
        answer.status === 0
          ? 'The server cannot be reached; the scans stay on this device.'
          : answer.status === 401 && token
            ? `The operator pass of ${chunk[0]?.operatorName ?? 'this operator'} has ended; those scans stay on this device until they scan their badge again.`
            : answer.error.message;
      for (const scan of chunk) await markScan(scan.key, problem);
      report.problem = problem;
      // A network failure stops the whole sync; a refused operator only stops that group.
      return answer.status !== 0;
    }
    report.sent += chunk.length;
    for (const result of answer.body.results) {
      const scan = chunk[result.index];
      if (!scan) continue;
      if ('event' in result) {
        if (result.replayed) report.replayed++;
        else report.recorded++;
      } else {
        // The same plain words as a live refusal: the state, and what may come next.
        const parsed = parseCode(scan.event.itemCode);
        const kind = parsed.ok && parsed.kind !== 'badge' ? parsed.kind : 'specimen';
        const words = resultOfAnswer(scan.event.type, scan.event.itemCode, kind, { ok: false, status: result.status, error: result.error }, null);
        const next = words.next.length > 0 ? ` What may come next: ${words.next.join(', ')}.` : '';
        report.refused.push({ scan, status: result.status, message: `${words.message}${next}` });
      }
      // Recorded, replayed or refused: the ledger has judged it, so the device lets it go.
      await forgetScan(scan.key);
    }
  }
  return true;
}

/**
 * Sends every kept scan (except those the live scanner is sending) and reports the outcome.
 * Only one sync runs at a time; a second call waits for the first.
 */
export function syncKeptScans(): Promise<SyncReport> {
  running ??= (async () => {
    const report: SyncReport = { at: new Date().toISOString(), sent: 0, recorded: 0, replayed: 0, refused: [], stillKept: 0, problem: null };
    try {
      const scans = (await pendingScans()).filter((s) => !inFlight.has(s.key));
      const groups = new Map<string | null, QueuedScan[]>();
      for (const scan of scans) groups.set(scan.operatorToken, [...(groups.get(scan.operatorToken) ?? []), scan]);
      for (const [token, group] of groups) {
        if (!(await sendGroup(group, token, report))) break;
      }
      report.stillKept = (await pendingScans()).length;
    } finally {
      running = null;
    }
    return report;
  })();
  return running;
}
