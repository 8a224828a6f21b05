import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import Decimal from 'decimal.js';
import { roundHalfEven, roundToIncrement, toDecimal } from './decimal-rounding';

describe('roundHalfEven (ASTM E29, ISO 80000-1 rule A)', () => {
  it('rounds the ASTM E29 examples', () => {
    // ASTM E29 rounding method examples, as read in a secondary copy.
    expect(roundHalfEven('45.75', 1)).toBe('45.8');
    expect(roundHalfEven('45.45', 1)).toBe('45.4');
    expect(roundHalfEven('45.45001', 1)).toBe('45.5');
  });

  it('rounds the ISO 80000-1 rule A examples', () => {
    // ISO 80000-1 Annex B, rule A: 12.25 → 12.2 and 12.35 → 12.4 (from memory, not read).
    expect(roundHalfEven('12.25', 1)).toBe('12.2');
    expect(roundHalfEven('12.35', 1)).toBe('12.4');
  });

  it('takes a number by its shortest text, where toFixed would be wrong', () => {
    // JavaScript's own rounding works on the binary value: (45.45).toFixed(1) is "45.5" and
    // (1.005).toFixed(2) is "1.00" (run in Node); neither follows the one-step rule.
    expect((45.45).toFixed(1)).toBe('45.5');
    expect((1.005).toFixed(2)).toBe('1.00');
    expect(roundHalfEven(45.45, 1)).toBe('45.4');
    expect(roundHalfEven(1.005, 2)).toBe('1.00');
    expect(roundHalfEven(1.015, 2)).toBe('1.02');
  });

  it('rounds in one step, not digit by digit', () => {
    // ASTM E29 asks for one step: 45.4501 is above half, so it goes to 45.5; rounding first to
    // 45.45 and then to one place would wrongly give 45.4.
    expect(roundHalfEven('45.4501', 1)).toBe('45.5');
    expect(roundHalfEven(roundHalfEven('45.4501', 2), 1)).toBe('45.4');
  });

  it('keeps the requested places and handles signs and integers', () => {
    expect(roundHalfEven('451.5', 0)).toBe('452');
    expect(roundHalfEven('452.5', 0)).toBe('452');
    expect(roundHalfEven('-2.25', 1)).toBe('-2.2');
    expect(roundHalfEven('-0.04', 1)).toBe('0.0');
    expect(roundHalfEven('7', 2)).toBe('7.00');
    expect(roundHalfEven(new Decimal('2.675'), 2)).toBe('2.68');
  });

  it('agrees with decimal.js ROUND_HALF_EVEN on random decimal strings', () => {
    // Reference: decimal.js toDecimalPlaces with ROUND_HALF_EVEN, on the default constructor.
    fc.assert(
      fc.property(
        fc.stringMatching(/^-?[1-9]\d{0,6}\.\d{1,8}$/),
        fc.integer({ min: 0, max: 6 }),
        (text, dp) => {
          const expected = new Decimal(text).toDecimalPlaces(dp, Decimal.ROUND_HALF_EVEN).toFixed(dp);
          expect(roundHalfEven(text, dp)).toBe(expected.replace(/^-(0\.?0*)$/, '$1'));
        },
      ),
    );
  });

  it('refuses what is not a finite decimal', () => {
    expect(() => roundHalfEven('12,5', 1)).toThrow(RangeError);
    expect(() => roundHalfEven('abc', 1)).toThrow(RangeError);
    expect(() => roundHalfEven(Number.NaN, 1)).toThrow(RangeError);
    expect(() => roundHalfEven('Infinity', 1)).toThrow(RangeError);
    expect(() => roundHalfEven('1.5', -1)).toThrow(RangeError);
    expect(() => toDecimal(Number.POSITIVE_INFINITY)).toThrow(RangeError);
  });
});

describe('roundToIncrement', () => {
  it('rounds strength to 1 MPa and elongation to 0.5 %', () => {
    // ISO 6892-1 reporting steps (strength 1 MPa, elongation 0.5 %; from memory). Ties go to the
    // even multiple, as ISO 80000-1 rule A says for rounding to a multiple (from memory).
    expect(roundToIncrement('451.54', '1')).toBe('452');
    expect(roundToIncrement('453.5', '1')).toBe('454');
    expect(roundToIncrement('452.5', '1')).toBe('452');
    expect(roundToIncrement('22.26', '0.5')).toBe('22.5');
    expect(roundToIncrement('22.24', '0.5')).toBe('22.0');
    // 22.25 is exactly halfway between 44 and 45 half-percent steps: the even multiple, 44, wins.
    expect(roundToIncrement('22.25', '0.5')).toBe('22.0');
    expect(roundToIncrement('22.75', '0.5')).toBe('23.0');
  });

  it('rounds to coarse and fine steps', () => {
    expect(roundToIncrement('62.59', '5')).toBe('65');
    expect(roundToIncrement('27.5', '5')).toBe('30');
    expect(roundToIncrement('22.5', '5')).toBe('20');
    expect(roundToIncrement('0.125', '0.05')).toBe('0.10');
    expect(roundToIncrement(45.45, '0.1')).toBe('45.4');
  });

  it('gives the same result as roundHalfEven for a power-of-ten step', () => {
    fc.assert(
      fc.property(fc.stringMatching(/^\d{1,5}\.\d{1,6}$/), fc.integer({ min: 0, max: 4 }), (text, dp) => {
        expect(roundToIncrement(text, new Decimal(10).pow(-dp))).toBe(roundHalfEven(text, dp));
      }),
    );
  });

  it('refuses a step that is not positive', () => {
    expect(() => roundToIncrement('1', '0')).toThrow(RangeError);
    expect(() => roundToIncrement('1', '-0.5')).toThrow(RangeError);
  });
});
