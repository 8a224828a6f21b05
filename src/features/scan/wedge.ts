/**
 * Keyboard-wedge barcode scanners type a code as a fast burst of keystrokes ending in Enter.
 * One listener on the window catches that burst wherever the focus is, tells it from a person
 * typing by the gaps between keys, and takes back any characters the burst left in a text field.
 */
import { parseCode } from '../../../shared/domain/codes';

/** Tuning of the burst detector. */
export interface WedgeOptions {
  /** Largest median gap between the keystrokes of a burst, ms; people typing stay well above it. */
  maxGapMs: number;
  /** Fewest characters a burst must have before Enter to count as a scan. */
  minLength: number;
  /** A pause this long ends a sequence of keys, ms. */
  pauseMs: number;
}

/** Defaults that suit USB and Bluetooth wedges, and tolerate a busy device's occasional slow key. */
export const DEFAULT_WEDGE_OPTIONS: WedgeOptions = { maxGapMs: 40, minLength: 5, pauseMs: 400 };

type Field = HTMLInputElement | HTMLTextAreaElement;

interface Key {
  char: string;
  at: number;
  /** The focused text field, and its value before this key went in. */
  field: Field | null;
  before: string;
}

function isField(el: Element | null): el is Field {
  return el instanceof HTMLInputElement || el instanceof HTMLTextAreaElement;
}

// React tracks an input's value through the prototype setter; setting it this way keeps the two in step.
function restoreField(field: Field, value: string): void {
  if (field.value === value) return;
  const proto = field instanceof HTMLInputElement ? HTMLInputElement.prototype : HTMLTextAreaElement.prototype;
  Object.getOwnPropertyDescriptor(proto, 'value')?.set?.call(field, value);
  field.dispatchEvent(new Event('input', { bubbles: true }));
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = Math.floor(sorted.length / 2);
  return sorted.length % 2 ? (sorted[mid] ?? 0) : ((sorted[mid - 1] ?? 0) + (sorted[mid] ?? 0)) / 2;
}

/**
 * Picks the scan out of a sequence of keys ending in Enter: the longest tail that reads as a
 * code (a person's stray keys just before a scan are left out), else the tail after the last
 * slow key; it is a scan when its keys came at wedge speed.
 */
function burstOf(keys: readonly Key[], enterAt: number, options: WedgeOptions): { start: number; text: string } | null {
  const starts = [0, ...keys.flatMap((k, i) => (i > 0 && k.at - (keys[i - 1]?.at ?? 0) > options.maxGapMs ? [i] : []))];
  const text = (from: number) => keys.slice(from).map((k) => k.char).join('');
  const start = starts.find((from) => parseCode(text(from)).ok) ?? starts.at(-1) ?? 0;
  const tail = keys.slice(start);
  if (tail.length < options.minLength) return null;
  const gaps = tail.slice(1).map((k, i) => k.at - (tail[i]?.at ?? k.at));
  gaps.push(enterAt - (tail.at(-1)?.at ?? enterAt));
  return median(gaps) <= options.maxGapMs ? { start, text: text(start) } : null;
}

/**
 * Starts listening for wedge scans on the whole page.
 *
 * @param onScan - Called with the scanned text and the time its Enter was pressed (on the performance.now() clock).
 * @param options - Gap, length and pause thresholds.
 * @returns A function that stops listening.
 */
export function listenForWedge(
  onScan: (text: string, endedAt: number) => void,
  options: WedgeOptions = DEFAULT_WEDGE_OPTIONS,
): () => void {
  let keys: Key[] = [];

  const onKeyDown = (event: KeyboardEvent) => {
    // When the key was pressed, not when this handler ran: a busy page can deliver a person's
    // keys back to back, and the scan's answer time counts from the real Enter.
    const now = event.timeStamp > 0 ? event.timeStamp : performance.now();
    if (event.ctrlKey || event.metaKey || event.altKey) {
      keys = [];
      return;
    }
    const lastAt = keys.at(-1)?.at ?? -Infinity;
    if (now - lastAt > options.pauseMs) keys = [];
    if (event.key === 'Enter') {
      const burst = keys.length > 0 ? burstOf(keys, now, options) : null;
      if (burst) {
        // The scan is ours: no form submits, no button presses, and the field gets its text back.
        event.preventDefault();
        event.stopPropagation();
        const first = keys[burst.start];
        if (first?.field) restoreField(first.field, first.before);
        keys = [];
        onScan(burst.text, now);
      } else {
        keys = [];
      }
      return;
    }
    if (event.key.length !== 1) return;
    const active = document.activeElement;
    const field = isField(active) ? active : null;
    keys.push({ char: event.key, at: now, field, before: field?.value ?? '' });
  };

  window.addEventListener('keydown', onKeyDown, true);
  return () => window.removeEventListener('keydown', onKeyDown, true);
}
