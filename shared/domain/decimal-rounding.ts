/**
 * Rounding of reported values by the ASTM E29 rounding method, which is rule A of
 * ISO 80000-1 Annex B: round in one step from the full value; an exact half (a 5
 * followed by nothing but zeros) goes to the even neighbour, anything above half goes up.
 * Values are handled as decimal strings, never as binary floating point, so 45.45
 * really is 45.45 and not 45.4500000000000028…
 */
import Decimal from 'decimal.js';

/**
 * A decimal.js constructor of its own, so no other module's global settings change ours:
 * 60 significant digits is far beyond any measurement, and ties go to the even neighbour.
 */
export const HalfmarkDecimal = Decimal.clone({
  precision: 60,
  rounding: Decimal.ROUND_HALF_EVEN,
  toExpNeg: -30,
  toExpPos: 40,
});

/** What the rounding functions accept: a decimal string, a finite number, or a Decimal. */
export type DecimalInput = string | number | Decimal;

/**
 * Reads a value as an exact decimal. A JavaScript number is taken by its shortest
 * round-trip text (45.45 → "45.45"), which is what a person typed or a file held.
 *
 * @param value - A decimal string such as "12.52", a finite number, or a Decimal.
 * @returns The value as a Decimal made by {@link HalfmarkDecimal}.
 * @throws RangeError when the value is not a finite decimal number.
 */
export function toDecimal(value: DecimalInput): Decimal {
  if (typeof value === 'number' && !Number.isFinite(value)) {
    throw new RangeError(`not a finite number: ${value}`);
  }
  let d: Decimal;
  try {
    d = new HalfmarkDecimal(typeof value === 'string' ? value.trim() : value);
  } catch {
    throw new RangeError(`not a decimal number: "${String(value)}"`);
  }
  if (!d.isFinite()) {
    throw new RangeError(`not a finite number: ${String(value)}`);
  }
  return d;
}

/**
 * Rounds to a number of decimal places, ties to even, in one step.
 *
 * @param value - The full, unrounded value.
 * @param decimals - Decimal places to keep, 0 to 20.
 * @returns A decimal string with exactly `decimals` places, e.g. roundHalfEven("45.45", 1) → "45.4".
 * @throws RangeError for a bad value or number of places.
 */
export function roundHalfEven(value: DecimalInput, decimals: number): string {
  if (!Number.isInteger(decimals) || decimals < 0 || decimals > 20) {
    throw new RangeError(`decimals must be a whole number from 0 to 20, got ${decimals}`);
  }
  const rounded = toDecimal(value).toFixed(decimals, HalfmarkDecimal.ROUND_HALF_EVEN);
  // toFixed keeps the sign of a negative value that rounds to zero ("-0.0"); a report shows "0.0".
  return /^-0(\.0*)?$/.test(rounded) ? rounded.slice(1) : rounded;
}

/**
 * Rounds to the nearest multiple of an increment (e.g. 0.5 % steps, 1 MPa, 5 mm),
 * choosing the even multiple when the value lies exactly halfway, in one step.
 *
 * @param value - The full, unrounded value.
 * @param increment - A positive step such as "0.5", "1", "5" or "0.05".
 * @returns A decimal string with as many places as the increment has,
 *   e.g. roundToIncrement("22.25", "0.5") → "22.0", roundToIncrement("451.5", "1") → "452".
 * @throws RangeError for a bad value or a non-positive increment.
 */
export function roundToIncrement(value: DecimalInput, increment: DecimalInput): string {
  const step = toDecimal(increment);
  if (step.lte(0)) {
    throw new RangeError(`increment must be positive, got ${String(increment)}`);
  }
  const multiples = toDecimal(value).div(step).toDecimalPlaces(0, HalfmarkDecimal.ROUND_HALF_EVEN);
  return roundHalfEven(multiples.mul(step), step.decimalPlaces());
}
