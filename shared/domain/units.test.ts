import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  DEFAULT_DECIMALS,
  KG_PER_POUND,
  N_PER_LBF,
  SI_UNIT,
  STANDARD_GRAVITY,
  UNITS,
  convert,
  formatFromSI,
  formatQuantity,
  fromSI,
  quantityOf,
  siFactor,
  toSI,
  unitSymbol,
  type Unit,
} from './units';
import { HalfmarkDecimal, roundHalfEven } from './decimal-rounding';

describe('exact factors (NIST SP 811, Appendix B)', () => {
  it('has 1 in = 25.4 mm exactly', () => {
    // NIST SP 811 Appendix B tables, as read in a secondary copy: inch (in) = 2.54 E-02 m, exact.
    expect(convert('1', 'in', 'mm').toString()).toBe('25.4');
    expect(convert('0.500', 'in', 'mm').toString()).toBe('12.7');
    expect(convert('1', 'in2', 'mm2').toString()).toBe('645.16');
  });

  it('has 1 lbf = 4.4482216152605 N exactly, from the pound and standard gravity', () => {
    // NIST SP 811 Appendix B tables, as read in a secondary copy: pound (avoirdupois) =
    // 0.45359237 kg exactly; standard acceleration of gravity 9.80665 m/s² exactly;
    // pound-force = 4.448 222 E+00 N in the table (rounded).
    expect(new HalfmarkDecimal(KG_PER_POUND).mul(STANDARD_GRAVITY).toString()).toBe(N_PER_LBF);
    expect(convert('1', 'lbf', 'N').toString()).toBe('4.4482216152605');
    expect(roundHalfEven(convert('1', 'lbf', 'N'), 6)).toBe('4.448222');
    expect(convert('1', 'kip', 'kN').toString()).toBe('4.4482216152605');
  });

  it('derives psi and ksi from lbf/in² and matches the table to its printed digits', () => {
    // NIST SP 811 Appendix B tables, as read in a secondary copy: pound-force per square inch
    // (psi) = 6.894 757 E+03 Pa; kip per square inch (ksi) = 6.894 757 E+06 Pa. 1 MPa = 1 N/mm².
    const psiInPa = convert('1', 'psi', 'MPa').mul(1e6);
    expect(roundHalfEven(psiInPa, 3)).toBe('6894.757');
    expect(roundHalfEven(convert('1', 'ksi', 'MPa'), 6)).toBe('6.894757');
    // The derived factor is lbf / in², not the rounded table value.
    expect(siFactor('psi').mul('645.16').toString()).toBe('4.4482216152605');
  });

  it('converts specification limits as a person would check them', () => {
    // ASTM A36 yield 36 ksi = 248.2 MPa (the SI limit is 250 MPa, a value of its own) [copy].
    expect(formatQuantity(convert('36', 'ksi', 'MPa'), 'MPa', 1)).toBe('248.2 MPa');
    // A572 Gr 50: 50 ksi ≈ 344.7 MPa, 65 ksi ≈ 448.2 MPa (arithmetic with the factor above).
    expect(roundHalfEven(convert('50', 'ksi', 'MPa'), 1)).toBe('344.7');
    expect(roundHalfEven(convert('65', 'ksi', 'MPa'), 1)).toBe('448.2');
    expect(formatFromSI('450', 'ksi')).toBe('65.3 ksi');
    expect(formatFromSI('450', 'psi')).toBe('65267 psi');
  });
});

describe('conversion helpers', () => {
  it('knows each unit’s quantity and symbol', () => {
    expect(quantityOf('ksi')).toBe('stress');
    expect(unitSymbol('mm2')).toBe('mm²');
    expect(unitSymbol('in2')).toBe('in²');
    for (const [quantity, units] of Object.entries(UNITS)) {
      expect(units[0]).toBe(SI_UNIT[quantity as keyof typeof SI_UNIT]);
      expect(siFactor(units[0]).toString()).toBe('1');
    }
  });

  it('refuses to mix quantities', () => {
    expect(() => convert<'length'>('1', 'mm', 'ksi' as 'in')).toThrow(RangeError);
  });

  it('round-trips every unit through SI', () => {
    const units = Object.values(UNITS).flat() as Unit[];
    fc.assert(
      fc.property(fc.stringMatching(/^\d{1,6}\.\d{1,4}$/), fc.constantFrom(...units), (text, unit) => {
        const back = toSI(fromSI(text, unit), unit);
        expect(back.toSignificantDigits(40).eq(text)).toBe(true);
      }),
    );
  });

  it('formats with the default places of each unit', () => {
    expect(DEFAULT_DECIMALS.in).toBe(3);
    expect(formatFromSI('12.7', 'in')).toBe('0.500 in');
    expect(formatFromSI('11250', 'lbf')).toBe('2529 lbf');
    expect(formatFromSI('11250', 'kN')).toBe('11.25 kN');
    expect(formatQuantity('24.8153', 'mm2', 4)).toBe('24.8153 mm²');
    expect(formatFromSI('24.8153', 'in2')).toBe('0.0385 in²');
  });
});
