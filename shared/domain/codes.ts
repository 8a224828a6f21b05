/**
 * Halfmark's own item codes: short, readable aloud, typable, and protected by an
 * ISO/IEC 7064 MOD 37-2 check character computed over the compact form (letters
 * and digits only, hyphens removed). The check character may be `*` ("star").
 *
 *   specimen   S26-00157-W    S + two-digit year + serial (≥ 5 digits) + check
 *   half       S26-00157A-6   the specimen's body + A or B + check
 *   container  C-00042-R      C + serial (≥ 5 digits) + check
 *   badge      U-K7MP3Q-Z     U + six characters without I, O, 0, 1 + check
 */
import { z } from 'zod';
import { computeMod37_2, isValidMod37_2 } from './check-character';

/** The kinds of item a code can name. */
export type CodeKind = 'specimen' | 'half' | 'container' | 'badge';

/** Which piece of a broken specimen: A keeps the specimen's mark, B gets its own label. */
export type HalfSide = 'A' | 'B';

/** Every code kind, in a stable order. */
export const CODE_KINDS: readonly CodeKind[] = ['specimen', 'half', 'container', 'badge'];

/** Characters a badge body may use: no I, O, 0 or 1, which are easily confused. */
export const BADGE_ALPHABET = '23456789ABCDEFGHJKLMNPQRSTUVWXYZ';

/** Largest serial a specimen or container code may carry (nine digits). */
export const MAX_SERIAL = 999_999_999;

/** A successfully parsed code. `code` is the display form, `compact` the form the check covers. */
export type ParsedCodeOk =
  | { ok: true; kind: 'specimen'; code: string; compact: string }
  | { ok: true; kind: 'half'; code: string; compact: string; specimenCode: string; half: HalfSide }
  | { ok: true; kind: 'container'; code: string; compact: string }
  | { ok: true; kind: 'badge'; code: string; compact: string };

/** Why a code was refused, with a message a person can act on. */
export interface ParsedCodeError {
  ok: false;
  reason: 'empty' | 'malformed' | 'check';
  message: string;
}

/** The result of {@link parseCode}. */
export type ParsedCode = ParsedCodeOk | ParsedCodeError;

// A serial is exactly five digits, or more digits without a leading zero, so each serial has one code.
const SERIAL = '(\\d{5}|[1-9]\\d{5,8})';
const CHECK = '([0-9A-Z*])';
const SPECIMEN_RE = new RegExp(`^S(\\d{2})${SERIAL}${CHECK}$`);
const HALF_RE = new RegExp(`^S(\\d{2})${SERIAL}([AB])${CHECK}$`);
const CONTAINER_RE = new RegExp(`^C${SERIAL}${CHECK}$`);
const BADGE_RE = new RegExp(`^U([${BADGE_ALPHABET}]{6})${CHECK}$`);

// Hyphen-like characters that copy and paste or phone keyboards put in place of "-".
const SEPARATORS = /[\s\-\u2010-\u2015\u2212]/g;

const PATTERN_TEXT: Record<CodeKind, string> = {
  specimen:
    'A specimen code is S, a two-digit year, a serial of at least five digits and a check character',
  half: 'A half code is a specimen code with A or B after the serial, then its own check character',
  container: 'A container code is C, a serial of at least five digits and a check character',
  badge:
    'A badge code is U, six letters or digits (never I, O, 0 or 1) and a check character',
};

/**
 * Puts a typed or scanned code into its compact form: trimmed, upper case, with
 * spaces and hyphens removed. It does not check the code.
 *
 * @param input - What was typed or scanned.
 * @returns The compact form, e.g. "S2600157W".
 */
export function normalizeCode(input: string): string {
  return input.trim().toUpperCase().replace(SEPARATORS, '');
}

type Structure =
  | { kind: 'specimen' | 'container' | 'badge'; code: string }
  | { kind: 'half'; code: string; specimenBody: string; half: HalfSide };

function structureOf(compact: string): Structure | null {
  let m = SPECIMEN_RE.exec(compact);
  if (m) {
    const [, year, serial, check] = m;
    return { kind: 'specimen', code: `S${year}-${serial}-${check}` };
  }
  m = HALF_RE.exec(compact);
  if (m) {
    const [, year, serial, side, check] = m;
    return {
      kind: 'half',
      code: `S${year}-${serial}${side}-${check}`,
      specimenBody: `S${year}${serial}`,
      half: side === 'B' ? 'B' : 'A',
    };
  }
  m = CONTAINER_RE.exec(compact);
  if (m) {
    const [, serial, check] = m;
    return { kind: 'container', code: `C-${serial}-${check}` };
  }
  m = BADGE_RE.exec(compact);
  if (m) {
    const [, chars, check] = m;
    return { kind: 'badge', code: `U-${chars}-${check}` };
  }
  return null;
}

/**
 * Writes a code in its display form, with hyphens. The check character is not verified.
 *
 * @param compact - A code in compact (or any normalisable) form.
 * @returns The display form, e.g. "S26-00157-W".
 * @throws RangeError when the input has the shape of no Halfmark code.
 */
export function formatCode(compact: string): string {
  const structure = structureOf(normalizeCode(compact));
  if (!structure) {
    throw new RangeError(`"${compact}" has the shape of no Halfmark code`);
  }
  return structure.code;
}

function malformedMessage(compact: string): string {
  if (/[^0-9A-Z*]/.test(compact)) {
    return 'Codes hold only letters, digits and hyphens, and may end in * (read "star"). Check for a stray character.';
  }
  if (compact.slice(0, -1).includes('*')) {
    return 'Only the last character of a code may be * (read "star"). Check the order of the characters.';
  }
  const example = (kind: CodeKind): string => `${PATTERN_TEXT[kind]}, such as ${codePatternHint(kind)}.`;
  switch (compact.charAt(0)) {
    case 'S':
      return `${example('specimen')} ${example('half')}`;
    case 'C':
      return example('container');
    case 'U':
      return example('badge');
    default:
      return 'This is not a Halfmark code: codes start with S (specimen or half), C (container) or U (badge).';
  }
}

/**
 * Reads a typed or scanned code: normalises it, recognises its kind and verifies
 * its MOD 37-2 check character.
 *
 * @param input - What was typed or scanned (any case, spaces and hyphens allowed).
 * @returns The kind with display and compact forms (and, for a half, its specimen's
 *   code and side), or the reason for refusal with a message a person can act on.
 */
export function parseCode(input: string): ParsedCode {
  const compact = normalizeCode(input);
  if (compact === '') {
    return { ok: false, reason: 'empty', message: 'Scan or type a code.' };
  }
  const structure = structureOf(compact);
  if (!structure) {
    return { ok: false, reason: 'malformed', message: malformedMessage(compact) };
  }
  if (!isValidMod37_2(compact)) {
    return {
      ok: false,
      reason: 'check',
      message:
        'The check character does not match: a character may be mistyped (0 and O, 1 and I, 8 and B look alike). Compare the code with its label, or scan it.',
    };
  }
  if (structure.kind === 'half') {
    return {
      ok: true,
      kind: 'half',
      code: structure.code,
      compact,
      specimenCode: withCheck(structure.specimenBody),
      half: structure.half,
    };
  }
  return { ok: true, kind: structure.kind, code: structure.code, compact };
}

function withCheck(body: string): string {
  return formatCode(body + computeMod37_2(body));
}

function checkSerial(serial: number): string {
  if (!Number.isSafeInteger(serial) || serial < 0 || serial > MAX_SERIAL) {
    throw new RangeError(`serial must be a whole number from 0 to ${MAX_SERIAL}, got ${serial}`);
  }
  return String(serial).padStart(5, '0');
}

/**
 * Makes a specimen code.
 *
 * @param year - The calendar year (e.g. 2026) or its last two digits (e.g. 26).
 * @param serial - The specimen's serial within the year, 0 to {@link MAX_SERIAL}.
 * @returns The display form, e.g. specimenCode(2026, 157) → "S26-00157-W".
 * @throws RangeError for a year outside 0–99 and 1000–9999, or a bad serial.
 */
export function specimenCode(year: number, serial: number): string {
  const validYear = Number.isInteger(year) && ((year >= 0 && year <= 99) || (year >= 1000 && year <= 9999));
  if (!validYear) {
    throw new RangeError(`year must be a calendar year or its last two digits, got ${year}`);
  }
  const yy = String(year % 100).padStart(2, '0');
  return withCheck(`S${yy}${checkSerial(serial)}`);
}

/**
 * Makes the code of one half of a broken specimen.
 *
 * @param specimen - The specimen's code, display or compact form.
 * @param half - 'A' for the half that keeps the mark, 'B' for the other.
 * @returns The half's display form, e.g. halfCode("S26-00157-W", "A") → "S26-00157A-6".
 * @throws RangeError when `specimen` is not a valid specimen code.
 */
export function halfCode(specimen: string, half: HalfSide): string {
  const parsed = parseCode(specimen);
  if (!parsed.ok) {
    throw new RangeError(`not a valid specimen code: ${parsed.message}`);
  }
  if (parsed.kind !== 'specimen') {
    throw new RangeError(`a half is made from a specimen code, not a ${parsed.kind} code`);
  }
  return withCheck(`${parsed.compact.slice(0, -1)}${half}`);
}

/**
 * Makes a container code.
 *
 * @param serial - The container's serial, 0 to {@link MAX_SERIAL}.
 * @returns The display form, e.g. containerCode(42) → "C-00042-R".
 */
export function containerCode(serial: number): string {
  return withCheck(`C${checkSerial(serial)}`);
}

function cryptoRandom(): number {
  const buffer = new Uint32Array(1);
  globalThis.crypto.getRandomValues(buffer);
  return (buffer[0] ?? 0) / 2 ** 32;
}

/**
 * Makes a new random badge code. Uniqueness is the caller's to enforce (32^6 ≈ 1.07 × 10^9 bodies).
 *
 * @param randomFn - Returns a number in [0, 1); defaults to the platform's cryptographic generator.
 * @returns The display form, e.g. "U-K7MP3Q-Z".
 */
export function badgeCode(randomFn: () => number = cryptoRandom): string {
  let chars = '';
  for (let i = 0; i < 6; i += 1) {
    const r = randomFn();
    if (!(r >= 0 && r < 1)) {
      throw new RangeError(`randomFn must return a number in [0, 1), got ${r}`);
    }
    chars += BADGE_ALPHABET.charAt(Math.floor(r * BADGE_ALPHABET.length));
  }
  return withCheck(`U${chars}`);
}

const HINTS: Record<CodeKind, () => string> = {
  specimen: () => specimenCode(26, 157),
  half: () => halfCode(specimenCode(26, 157), 'A'),
  container: () => containerCode(42),
  badge: () => withCheck('UK7MP3Q'),
};

/**
 * A valid example code of one kind, for placeholders and help text.
 *
 * @param kind - The kind of code.
 * @returns e.g. "S26-00157-W" for a specimen.
 */
export function codePatternHint(kind: CodeKind): string {
  return HINTS[kind]();
}

/**
 * A sentence describing how a code of one kind is built, for help text.
 *
 * @param kind - The kind of code.
 */
export function describeCodePattern(kind: CodeKind): string {
  return `${PATTERN_TEXT[kind]}, such as ${codePatternHint(kind)}.`;
}

/**
 * Builds a zod schema that accepts a code of the given kinds (all kinds when none are given)
 * and outputs its display form.
 *
 * @param kinds - The kinds accepted.
 */
export function codeSchemaFor(...kinds: CodeKind[]) {
  const accepted = kinds.length > 0 ? kinds : CODE_KINDS;
  return z.string().transform((input, ctx) => {
    const parsed = parseCode(input);
    if (!parsed.ok) {
      ctx.addIssue({ code: 'custom', message: parsed.message, params: { reason: parsed.reason } });
      return z.NEVER;
    }
    if (!accepted.includes(parsed.kind)) {
      ctx.addIssue({
        code: 'custom',
        message: `${parsed.code} is a ${parsed.kind} code; expected a ${accepted.join(' or ')} code.`,
        params: { reason: 'kind' },
      });
      return z.NEVER;
    }
    return parsed.code;
  });
}

/** Any valid Halfmark code; parses to its display form. */
export const CodeSchema = codeSchemaFor();
