/** Turning what happened to a scan into what the person at the bench reads. */
import { describeState, TRANSITIONS, type EventType, type ItemKind } from '../../../shared/domain/ledger/state-machine';
import { eventWords, scanAction } from './actions';
import type { Answer } from './api/http';
import type { ItemSummary, RecordedEvent } from './api/types';
import type { Outcome } from './feedback';

/** What the result panel shows for one scan. */
export interface ScanResult {
  /** Increases with every result, so the panel can tell a new one from the last. */
  serial: number;
  outcome: Outcome;
  /** The large words: "Cut", "Already recorded", "Refused". */
  title: string;
  code: string | null;
  message: string;
  /** The item's state afterwards, or at refusal. */
  item: Pick<ItemSummary, 'kind' | 'state'> | null;
  /** What may come next, in plain words (refusals). */
  next: string[];
  /** Half B's code, when a test broke the specimen. */
  halfB: string | null;
  flags: string[];
  /** When the scan's last key arrived (performance.now()), to time the answer. */
  scannedAt: number | null;
  /** The name of the sound and vibration pattern played for it. */
  feedback?: string;
}

let serial = 0;

/** Builds a result, numbering it. */
export function result(partial: Omit<ScanResult, 'serial' | 'item' | 'next' | 'halfB' | 'flags' | 'scannedAt'> & Partial<ScanResult>): ScanResult {
  serial += 1;
  return { item: null, next: [], halfB: null, flags: [], scannedAt: null, ...partial, serial };
}

/** Whether an item in `state` has already had `type` done (so a refusal means "done before"). */
export function alreadyDone(kind: ItemKind, type: EventType, state: string): boolean {
  const to = TRANSITIONS[kind][type]?.to;
  if (to === undefined) return false;
  if (to === 'by-fracture') return state === 'broken' || state === 'tested';
  if (to === 'same') return false;
  // Actions that may repeat (a second measurement) are not "already done".
  if (TRANSITIONS[kind][type]?.from.includes(state as never)) return false;
  return to === state;
}

const FLAG_WORDS: Record<string, string> = { out_of_tolerance: 'Out of tolerance: flagged for review' };

/**
 * The result of posting one event.
 *
 * @param type - The event type posted.
 * @param code - The item's display code.
 * @param kind - The item's kind, as parsed from its code.
 * @param answer - The server's answer.
 * @param scannedAt - When the scan's last key arrived, to time the answer.
 */
export function resultOfAnswer(type: EventType, code: string, kind: ItemKind, answer: Answer<RecordedEvent>, scannedAt: number | null): ScanResult {
  const done = scanAction(type)?.done ?? eventWords(type);
  if (answer.ok) {
    const body = answer.body;
    const state = describeState(body.item.state);
    const halfB = body.halves.find((h) => /B-.$/.test(h)) ?? null;
    if (body.replayed) {
      return result({ outcome: 'already', title: 'Already recorded', code, message: `${done}: this scan was recorded before; nothing was added. ${code} is ${state}.`, item: body.item, halfB, scannedAt });
    }
    return result({
      outcome: 'accepted',
      title: done,
      code,
      message: `${code} is now ${state}.`,
      item: body.item,
      halfB,
      flags: body.flags.map((f) => FLAG_WORDS[f] ?? f.replace(/_/g, ' ')),
      scannedAt,
    });
  }
  const error = answer.error;
  if (answer.status === 409 && error.code === 'state_refused') {
    const details = (error.details ?? {}) as { state?: string; allowed?: string[] };
    const state = details.state ?? 'none';
    const next = (details.allowed ?? []).map(eventWords);
    if (alreadyDone(kind, type, state)) {
      return result({ outcome: 'already', title: 'Already recorded', code, message: `${code} is already ${describeState(state as never)}; nothing new was recorded.`, item: { kind, state: state as never }, next, scannedAt });
    }
    return result({
      outcome: 'refused',
      title: 'Refused',
      code,
      message: `${code} is ${describeState(state as never)}, so it cannot be ${done.toLowerCase()} now. Nothing was recorded.`,
      item: { kind, state: state as never },
      next,
      scannedAt,
    });
  }
  if (answer.status === 404) {
    return result({ outcome: 'refused', title: 'Unknown code', code, message: error.message, scannedAt });
  }
  return result({ outcome: 'refused', title: 'Refused', code, message: `${error.message} Nothing was recorded.`, scannedAt });
}
