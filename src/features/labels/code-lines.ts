import { normalizeCode, parseCode, type CodeKind } from '../../../shared/domain/codes';

/** One line of the item list, read as the person types or scans. */
export type CodeLine =
  | { kind: 'good'; text: string; code: string }
  | { kind: 'problem'; text: string; message: string }
  | { kind: 'typing'; text: string };

// A code is at least eight compact characters (U + six + check); shorter text may still be typed.
const MIN_COMPLETE = 8;

/**
 * Splits pasted or scanned text into codes (one per line, or separated by commas, semicolons or
 * tabs) and checks each: its check character, its shape, and that it is a code of `want`.
 * A short last line counts as still being typed unless its check character is already wrong.
 *
 * @param text - The list as typed, pasted or scanned.
 * @param want - The code kind the chosen label prints.
 */
export function readCodeLines(text: string, want: CodeKind): CodeLine[] {
  const parts = text.split(/[\n\r,;\t]+/).map((p) => p.trim());
  const lines: CodeLine[] = [];
  parts.forEach((part, i) => {
    if (part === '') return;
    const parsed = parseCode(part);
    const last = i === parts.length - 1;
    if (!parsed.ok) {
      const short = normalizeCode(part).length < MIN_COMPLETE;
      if (last && short && parsed.reason !== 'check') lines.push({ kind: 'typing', text: part });
      else lines.push({ kind: 'problem', text: part, message: parsed.message });
      return;
    }
    if (parsed.kind !== want) {
      lines.push({ kind: 'problem', text: part, message: `${parsed.code} is a ${parsed.kind} code; these labels take ${want} codes.` });
      return;
    }
    lines.push({ kind: 'good', text: part, code: parsed.code });
  });
  return lines;
}

/** The codes of the good lines, in order (a code listed twice prints two labels). */
export function goodCodes(lines: readonly CodeLine[]): string[] {
  return lines.flatMap((l) => (l.kind === 'good' ? [l.code] : []));
}
