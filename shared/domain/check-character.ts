/**
 * ISO/IEC 7064 pure check character systems.
 *
 * A pure system appends check characters so that, reading the whole string as
 * digits in `radix` (the rightmost check character having weight r^0), the sum
 * of value × weight is congruent to 1 modulo `modulus`. MOD 37-2, MOD 11-2 and
 * MOD 97-10 are the three pure systems Halfmark needs; the generic functions
 * accept any pure-system parameters.
 */

/** Parameters of one ISO/IEC 7064 pure system. */
export interface PureSystem {
  /** Human-readable name, e.g. "ISO/IEC 7064 MOD 37-2". */
  readonly name: string;
  /** The modulus M (a prime, or 97 for MOD 97-10). */
  readonly modulus: number;
  /** The radix r, the weight ratio between neighbouring positions. */
  readonly radix: number;
  /** Characters allowed in the body; a character's value is its index. */
  readonly bodyAlphabet: string;
  /** Characters a check position may hold; a character's value is its index. */
  readonly alphabet: string;
  /** How many check characters the system appends (1 or 2). */
  readonly checkLength: 1 | 2;
}

/** ISO/IEC 7064 MOD 37-2: alphanumeric body, one check character from 0-9, A-Z or `*`. */
export const MOD37_2: PureSystem = {
  name: 'ISO/IEC 7064 MOD 37-2',
  modulus: 37,
  radix: 2,
  bodyAlphabet: '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ',
  alphabet: '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ*',
  checkLength: 1,
};

/** ISO/IEC 7064 MOD 11-2: numeric body, one check character from 0-9 or `X`. */
export const MOD11_2: PureSystem = {
  name: 'ISO/IEC 7064 MOD 11-2',
  modulus: 11,
  radix: 2,
  bodyAlphabet: '0123456789',
  alphabet: '0123456789X',
  checkLength: 1,
};

/** ISO/IEC 7064 MOD 97-10: numeric body, two check digits. */
export const MOD97_10: PureSystem = {
  name: 'ISO/IEC 7064 MOD 97-10',
  modulus: 97,
  radix: 10,
  bodyAlphabet: '0123456789',
  alphabet: '0123456789',
  checkLength: 2,
};

function valueOf(char: string, alphabet: string): number {
  return alphabet.indexOf(char);
}

/**
 * Computes the check character(s) of `body` under a pure system.
 *
 * @param body - The string to protect, using only `system.bodyAlphabet` (case-sensitive).
 * @param system - The pure system's parameters.
 * @returns The check character(s), `system.checkLength` characters long.
 * @throws RangeError when `body` holds a character outside the body alphabet.
 */
export function iso7064PureCheck(body: string, system: PureSystem): string {
  const { modulus, radix, bodyAlphabet, alphabet, checkLength } = system;
  let p = 0;
  for (const char of body) {
    const value = valueOf(char, bodyAlphabet);
    if (value < 0) {
      throw new RangeError(`${system.name}: "${char}" is not allowed in the body`);
    }
    p = ((p + value) * radix) % modulus;
  }
  // The body has been shifted left by one position; a two-character check shifts it once more.
  for (let i = 1; i < checkLength; i += 1) {
    p = (p * radix) % modulus;
  }
  if (checkLength === 1) {
    return alphabet.charAt((modulus + 1 - p) % modulus);
  }
  // Two check characters take the value M + 1 - P (2 to M + 1), never reduced further: MOD 97-10
  // gives 02 to 98 and never 00, 01 or 99, as IBAN check digits are written.
  let check = modulus + 1 - p;
  let out = '';
  for (let i = 0; i < checkLength; i += 1) {
    out = alphabet.charAt(check % radix) + out;
    check = Math.floor(check / radix);
  }
  return out;
}

/**
 * Computes the weighted remainder of a whole protected string (body and check
 * characters). A string is valid when this remainder is 1.
 *
 * @param full - Body followed by its check character(s).
 * @param system - The pure system's parameters.
 * @returns The remainder modulo `system.modulus`, or `null` when a character is not allowed where it stands.
 */
export function iso7064PureRemainder(full: string, system: PureSystem): number | null {
  const { modulus, radix, bodyAlphabet, alphabet, checkLength } = system;
  const chars = [...full];
  const bodyEnd = chars.length - checkLength;
  let p = 0;
  for (let i = 0; i < chars.length; i += 1) {
    const char = chars[i] ?? '';
    const value = valueOf(char, i < bodyEnd ? bodyAlphabet : alphabet);
    if (value < 0) return null;
    // A two-character check is written in base `radix`, so each of its digits stays below the radix.
    if (i >= bodyEnd && checkLength > 1 && value >= radix) return null;
    p = (p * radix + value) % modulus;
  }
  return p;
}

/**
 * Tells whether `full` (a non-empty body followed by its check characters) is valid under a pure system.
 *
 * @param full - Body followed by its check character(s); case-sensitive.
 * @param system - The pure system's parameters.
 * @returns True when the body is non-empty, every character is allowed, the remainder is 1 and
 *   the check characters are the ones the system produces.
 */
export function iso7064PureIsValid(full: string, system: PureSystem): boolean {
  const chars = [...full];
  if (chars.length <= system.checkLength) return false;
  if (iso7064PureRemainder(full, system) !== 1) return false;
  // With two check characters the remainder alone would also accept 01 where 98 is due;
  // only the check characters the system itself produces count as valid.
  const body = chars.slice(0, -system.checkLength).join('');
  return iso7064PureCheck(body, system) === chars.slice(-system.checkLength).join('');
}

/**
 * MOD 37-2 check character of an alphanumeric body (0-9, A-Z, upper case).
 *
 * @param body - The string to protect.
 * @returns One character from 0-9, A-Z or `*`.
 */
export function computeMod37_2(body: string): string {
  return iso7064PureCheck(body, MOD37_2);
}

/**
 * Tells whether an upper-case alphanumeric string ends in its MOD 37-2 check character.
 *
 * @param full - Body followed by one check character.
 */
export function isValidMod37_2(full: string): boolean {
  return iso7064PureIsValid(full, MOD37_2);
}

/**
 * MOD 11-2 check character of a numeric body.
 *
 * @param body - Digits to protect.
 * @returns One character from 0-9 or `X`.
 */
export function computeMod11_2(body: string): string {
  return iso7064PureCheck(body, MOD11_2);
}

/**
 * Tells whether a numeric string ends in its MOD 11-2 check character.
 *
 * @param full - Digits followed by one check character (0-9 or `X`).
 */
export function isValidMod11_2(full: string): boolean {
  return iso7064PureIsValid(full, MOD11_2);
}

/**
 * MOD 97-10 check digits of a numeric body.
 *
 * @param body - Digits to protect.
 * @returns Two digits, "02" to "98".
 */
export function computeMod97_10(body: string): string {
  return iso7064PureCheck(body, MOD97_10);
}

/**
 * Tells whether a numeric string ends in its two MOD 97-10 check digits.
 *
 * @param full - Digits followed by two check digits.
 */
export function isValidMod97_10(full: string): boolean {
  return iso7064PureIsValid(full, MOD97_10);
}

/** One pure system bundled with its compute and validate functions. */
export interface CheckCharacterScheme {
  readonly system: PureSystem;
  /** Check character(s) of a body. */
  compute(body: string): string;
  /** Whether a body followed by its check character(s) is valid. */
  isValid(full: string): boolean;
}

/** ISO/IEC 7064 MOD 37-2 as one object. */
export const mod37_2: CheckCharacterScheme = {
  system: MOD37_2,
  compute: computeMod37_2,
  isValid: isValidMod37_2,
};

/** ISO/IEC 7064 MOD 11-2 as one object. */
export const mod11_2: CheckCharacterScheme = {
  system: MOD11_2,
  compute: computeMod11_2,
  isValid: isValidMod11_2,
};

/** ISO/IEC 7064 MOD 97-10 as one object. */
export const mod97_10: CheckCharacterScheme = {
  system: MOD97_10,
  compute: computeMod97_10,
  isValid: isValidMod97_10,
};
