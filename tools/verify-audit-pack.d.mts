// Types for the standalone verifier, so the TypeScript tests can import its parts. The script
// itself stays plain JavaScript with no dependencies.

/** A break the verifier names. */
export interface PackBreak {
  line: number;
  record: 'header' | 'event' | 'seal';
  reason: string;
  message: string;
  item: string | null;
  seq: number | null;
  day: string | null;
  expected: string | number | null;
  actual: string | number | null;
  items: { item: string; change: 'missing' | 'unsealed' | 'changed'; sealed: { seq: number; hash: string } | null; recomputed: { seq: number; hash: string } | null }[];
}

/** What verifyPack answers. */
export type PackReport =
  | { ok: true; eventsChecked: number; sealsChecked: number; lastSeal: { day: string; hash: string } | null }
  | { ok: false; eventsChecked: number; sealsChecked: number; firstBreak: PackBreak };

export class CanonicalError extends Error {}
export function canonicalize(value: unknown): string;
export function hashOf(value: unknown): string;
export function verifyPack(text: string): PackReport;
export function describeReport(report: PackReport): string;
