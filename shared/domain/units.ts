/**
 * SI ↔ US customary conversion for the quantities Halfmark shows: length, area,
 * force and stress. Halfmark stores SI (mm, mm², N, MPa); US customary units are
 * for display. Factors are exact decimals: the inch and the pound-force are defined
 * exactly, and psi and ksi are derived from them (lbf/in²), so no rounded table
 * value enters a conversion; rounding happens once, when a value is shown.
 */
import type Decimal from 'decimal.js';
import { type DecimalInput, HalfmarkDecimal, roundHalfEven, toDecimal } from './decimal-rounding';

/** Millimetres in one inch, exactly. */
export const MM_PER_INCH = '25.4';

/** Kilograms in one avoirdupois pound, exactly. */
export const KG_PER_POUND = '0.45359237';

/** Standard acceleration of gravity in m/s², exactly. */
export const STANDARD_GRAVITY = '9.80665';

/** Newtons in one pound-force (pound × standard gravity), exactly. */
export const N_PER_LBF = '4.4482216152605';

/** Square millimetres in one square inch, exactly. */
export const MM2_PER_SQUARE_INCH = '645.16';

/** The units Halfmark converts between, by quantity. SI units come first. */
export const UNITS = {
  length: ['mm', 'in'],
  area: ['mm2', 'in2'],
  force: ['N', 'kN', 'lbf', 'kip'],
  stress: ['MPa', 'psi', 'ksi'],
} as const;

/** A physical quantity Halfmark converts. */
export type Quantity = keyof typeof UNITS;

/** A unit of one quantity. */
export type UnitOf<Q extends Quantity> = (typeof UNITS)[Q][number];

/** Any unit Halfmark converts. */
export type Unit = UnitOf<Quantity>;

/** The SI unit each quantity is stored in. */
export const SI_UNIT: { readonly [Q in Quantity]: UnitOf<Q> } = {
  length: 'mm',
  area: 'mm2',
  force: 'N',
  stress: 'MPa',
};

const lbfPerSquareInchInMpa = new HalfmarkDecimal(N_PER_LBF).div(MM2_PER_SQUARE_INCH);

// How many stored SI units (mm, mm², N, MPa) one of each unit is.
const SI_PER_UNIT: Record<Unit, Decimal> = {
  mm: new HalfmarkDecimal(1),
  in: new HalfmarkDecimal(MM_PER_INCH),
  mm2: new HalfmarkDecimal(1),
  in2: new HalfmarkDecimal(MM2_PER_SQUARE_INCH),
  N: new HalfmarkDecimal(1),
  kN: new HalfmarkDecimal(1000),
  lbf: new HalfmarkDecimal(N_PER_LBF),
  kip: new HalfmarkDecimal(N_PER_LBF).mul(1000),
  MPa: new HalfmarkDecimal(1),
  psi: lbfPerSquareInchInMpa,
  ksi: lbfPerSquareInchInMpa.mul(1000),
};

const QUANTITY_OF: Record<Unit, Quantity> = {
  mm: 'length',
  in: 'length',
  mm2: 'area',
  in2: 'area',
  N: 'force',
  kN: 'force',
  lbf: 'force',
  kip: 'force',
  MPa: 'stress',
  psi: 'stress',
  ksi: 'stress',
};

const SYMBOL: Record<Unit, string> = {
  mm: 'mm',
  in: 'in',
  mm2: 'mm²',
  in2: 'in²',
  N: 'N',
  kN: 'kN',
  lbf: 'lbf',
  kip: 'kip',
  MPa: 'MPa',
  psi: 'psi',
  ksi: 'ksi',
};

/**
 * Decimal places each unit is shown with unless the caller says otherwise (common practice:
 * 0.01 mm and 0.001 in for dimensions, 1 MPa and 0.1 ksi for strength).
 */
export const DEFAULT_DECIMALS: Readonly<Record<Unit, number>> = {
  mm: 2,
  in: 3,
  mm2: 2,
  in2: 4,
  N: 0,
  kN: 2,
  lbf: 0,
  kip: 3,
  MPa: 0,
  psi: 0,
  ksi: 1,
};

/**
 * The quantity a unit measures.
 *
 * @param unit - A unit Halfmark converts.
 */
export function quantityOf(unit: Unit): Quantity {
  return QUANTITY_OF[unit];
}

/**
 * The printed symbol of a unit, e.g. "mm²" for 'mm2'.
 *
 * @param unit - A unit Halfmark converts.
 */
export function unitSymbol(unit: Unit): string {
  return SYMBOL[unit];
}

/**
 * How many of the quantity's SI units one `unit` is, exactly (to 60 significant digits
 * where the ratio does not terminate, as for psi).
 *
 * @param unit - A unit Halfmark converts.
 */
export function siFactor(unit: Unit): Decimal {
  return SI_PER_UNIT[unit];
}

/**
 * Converts a value between two units of the same quantity, without rounding.
 *
 * @param value - The value in `from` units (decimal string, number or Decimal).
 * @param from - Its unit.
 * @param to - The unit wanted.
 * @returns The exact converted value as a Decimal.
 * @throws RangeError when the units measure different quantities, or the value is not a finite decimal.
 */
export function convert<Q extends Quantity>(value: DecimalInput, from: UnitOf<Q>, to: UnitOf<Q>): Decimal {
  if (QUANTITY_OF[from] !== QUANTITY_OF[to]) {
    throw new RangeError(`cannot convert ${from} (${QUANTITY_OF[from]}) to ${to} (${QUANTITY_OF[to]})`);
  }
  return toDecimal(value).mul(SI_PER_UNIT[from]).div(SI_PER_UNIT[to]);
}

/**
 * Converts a stored SI value (mm, mm², N or MPa) to a display unit, without rounding.
 *
 * @param siValue - The value in the SI unit of `unit`'s quantity.
 * @param unit - The display unit.
 */
export function fromSI(siValue: DecimalInput, unit: Unit): Decimal {
  return toDecimal(siValue).div(SI_PER_UNIT[unit]);
}

/**
 * Converts a value in any unit to the SI unit it is stored in, without rounding.
 *
 * @param value - The value in `unit`.
 * @param unit - Its unit.
 */
export function toSI(value: DecimalInput, unit: Unit): Decimal {
  return toDecimal(value).mul(SI_PER_UNIT[unit]);
}

/**
 * Writes a value with its unit symbol, rounded once (half to even).
 *
 * @param value - The value, already in `unit`.
 * @param unit - Its unit.
 * @param decimals - Decimal places; defaults to {@link DEFAULT_DECIMALS}.
 * @returns e.g. formatQuantity("451.54", "MPa") → "452 MPa".
 */
export function formatQuantity(value: DecimalInput, unit: Unit, decimals: number = DEFAULT_DECIMALS[unit]): string {
  return `${roundHalfEven(value, decimals)} ${SYMBOL[unit]}`;
}

/**
 * Shows a stored SI value in a display unit: converts exactly, then rounds once.
 *
 * @param siValue - The value in the SI unit of `unit`'s quantity (mm, mm², N or MPa).
 * @param unit - The display unit.
 * @param decimals - Decimal places; defaults to {@link DEFAULT_DECIMALS}.
 * @returns e.g. formatFromSI("450", "ksi") → "65.3 ksi".
 */
export function formatFromSI(siValue: DecimalInput, unit: Unit, decimals: number = DEFAULT_DECIMALS[unit]): string {
  return formatQuantity(fromSI(siValue, unit), unit, decimals);
}
