import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as cdigit from 'cdigit';
import { isValidIBAN } from 'ibantools';
import {
  computeMod11_2,
  computeMod37_2,
  computeMod97_10,
  iso7064PureCheck,
  iso7064PureRemainder,
  isValidMod11_2,
  isValidMod37_2,
  isValidMod97_10,
  mod11_2,
  mod37_2,
  mod97_10,
} from './check-character';

/** IBAN check arithmetic: move the first four characters to the end, then letters A..Z → 10..35. */
function ibanToDigits(iban: string): string {
  const compact = iban.replace(/\s+/g, '').toUpperCase();
  const moved = compact.slice(4) + compact.slice(0, 4);
  return [...moved].map((c) => (/[A-Z]/.test(c) ? String(c.charCodeAt(0) - 55) : c)).join('');
}

describe('MOD 37-2', () => {
  it('gives H for G123498654321', () => {
    // ISO/IEC 7064 MOD 37-2 example, as read in a secondary copy; reproduced with cdigit.
    expect(computeMod37_2('G123498654321')).toBe('H');
    expect(cdigit.mod37_2.compute('G123498654321')).toBe('H');
    expect(isValidMod37_2('G123498654321H')).toBe(true);
    expect(isValidMod37_2('G123498654321G')).toBe(false);
  });

  it('can give * as the check character (value 36)', () => {
    // cdigit (an independent implementation) agrees on a body whose check is '*'.
    const body = fc.sample(fc.stringMatching(/^[0-9A-Z]{1,12}$/), { numRuns: 5000, seed: 7 }).find(
      (b) => cdigit.mod37_2.compute(b) === '*',
    );
    expect(body).toBeDefined();
    expect(computeMod37_2(body ?? '')).toBe('*');
    expect(isValidMod37_2(`${body ?? ''}*`)).toBe(true);
  });

  it('agrees with cdigit on random bodies', () => {
    // Reference: the cdigit npm package's mod37_2.
    fc.assert(
      fc.property(fc.stringMatching(/^[0-9A-Z]{1,30}$/), (body) => {
        const check = computeMod37_2(body);
        expect(check).toBe(cdigit.mod37_2.compute(body));
        expect(isValidMod37_2(body + check)).toBe(true);
        expect(cdigit.mod37_2.validate(body + check)).toBe(true);
      }),
    );
  });

  it('refuses characters outside its alphabet', () => {
    expect(() => computeMod37_2('ab12')).toThrow(RangeError);
    expect(() => computeMod37_2('A*')).toThrow(RangeError);
    expect(isValidMod37_2('A-1')).toBe(false);
    expect(isValidMod37_2('')).toBe(false);
    // A lone check character has no body to protect.
    expect(isValidMod37_2('1')).toBe(false);
  });

  it('exposes the same functions as an object', () => {
    expect(mod37_2.compute('G123498654321')).toBe('H');
    expect(mod37_2.isValid('G123498654321H')).toBe(true);
    expect(mod37_2.system.modulus).toBe(37);
  });
});

describe('MOD 11-2', () => {
  it('gives X for 079 and 0 for 0794', () => {
    // ISO/IEC 7064 MOD 11-2 examples, as read in a secondary copy; reproduced with cdigit.
    expect(computeMod11_2('079')).toBe('X');
    expect(computeMod11_2('0794')).toBe('0');
    expect(cdigit.mod11_2.compute('079')).toBe('X');
    expect(cdigit.mod11_2.compute('0794')).toBe('0');
    expect(isValidMod11_2('079X')).toBe(true);
    expect(isValidMod11_2('07940')).toBe(true);
  });

  it('validates ORCID identifiers', () => {
    // ORCID iDs end in a MOD 11-2 check character; both examples are published ORCID
    // samples read in a secondary copy, and cdigit agrees.
    for (const orcid of ['0000-0002-1825-0097', '0000-0002-1694-233X']) {
      const digits = orcid.replace(/-/g, '');
      expect(isValidMod11_2(digits)).toBe(true);
      expect(cdigit.mod11_2.validate(digits)).toBe(true);
      expect(computeMod11_2(digits.slice(0, -1))).toBe(digits.slice(-1));
    }
    expect(isValidMod11_2('0000000218250098')).toBe(false);
  });

  it('is not the ISBN-10 check: 0-306-40615-2 is a valid ISBN but not MOD 11-2', () => {
    // ISBN-10 uses weights 10..2 and sum ≡ 0 mod 11 (ISO 2108); 0-306-40615-2 is the usual
    // valid example. MOD 11-2 over the same nine digits gives 1, as cdigit confirms.
    const isbn = '0306406152';
    const weighted = [...isbn].reduce((sum, c, i) => sum + Number(c) * (10 - i), 0);
    expect(weighted % 11).toBe(0);
    expect(computeMod11_2('030640615')).toBe('1');
    expect(cdigit.mod11_2.compute('030640615')).toBe('1');
    expect(isValidMod11_2(isbn)).toBe(false);
  });

  it('agrees with cdigit on random bodies', () => {
    fc.assert(
      fc.property(fc.stringMatching(/^[0-9]{1,30}$/), (body) => {
        expect(mod11_2.compute(body)).toBe(cdigit.mod11_2.compute(body));
      }),
    );
  });
});

describe('MOD 97-10', () => {
  it('gives 44 for 794', () => {
    // ISO/IEC 7064 §8.4 example, as read in a secondary copy; reproduced with cdigit.
    expect(computeMod97_10('794')).toBe('44');
    expect(cdigit.mod97_10.compute('794')).toBe('44');
    expect(isValidMod97_10('79444')).toBe(true);
    expect(isValidMod97_10('79445')).toBe(false);
  });

  it('writes a zero remainder as 98, not 01, as cdigit and IBAN do', () => {
    // IBAN check digits run 02..98 (ISO 13616); cdigit gives 98 for the body "0".
    expect(computeMod97_10('0')).toBe('98');
    expect(cdigit.mod97_10.compute('0')).toBe('98');
    expect(isValidMod97_10('098')).toBe(true);
    expect(isValidMod97_10('001')).toBe(false);
  });

  it('agrees with cdigit on random bodies, including leading zeros', () => {
    fc.assert(
      fc.property(fc.stringMatching(/^[0-9]{1,40}$/), (body) => {
        const check = mod97_10.compute(body);
        expect(check).toMatch(/^\d\d$/);
        expect(check).toBe(cdigit.mod97_10.compute(body));
        expect(mod97_10.isValid(body + check)).toBe(true);
      }),
    );
  });

  it.each([
    // GB82 WEST 1234 5698 7654 32: the textbook valid IBAN (ISO 13616 / ECBS example).
    'GB82WEST12345698765432',
    // DE89370400440532013000 and GB29NWBK60161331926819: valid, reproduced with ibantools.
    'DE89370400440532013000',
    'GB29NWBK60161331926819',
  ])('checks IBAN %s with MOD 97-10 arithmetic', (iban) => {
    expect(isValidIBAN(iban)).toBe(true);
    const digits = ibanToDigits(iban);
    expect(iso7064PureRemainder(digits, mod97_10.system)).toBe(1);
    expect(isValidMod97_10(digits)).toBe(true);
    // The IBAN's own check digits are the MOD 97-10 check of the moved, converted rest.
    expect(computeMod97_10(digits.slice(0, -2))).toBe(iban.slice(2, 4));
  });

  it('catches a mistyped IBAN, as ibantools does', () => {
    const typo = 'GB82WEST12345698765423';
    expect(isValidIBAN(typo)).toBe(false);
    expect(isValidMod97_10(ibanToDigits(typo))).toBe(false);
  });
});

describe('generic pure system', () => {
  it('reproduces MOD 1271-36 from its parameters, as cdigit computes it', () => {
    // ISO/IEC 7064 MOD 1271-36: modulus 1271, radix 36, two alphanumeric check characters.
    const system = {
      name: 'ISO/IEC 7064 MOD 1271-36',
      modulus: 1271,
      radix: 36,
      bodyAlphabet: '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ',
      alphabet: '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ',
      checkLength: 2,
    } as const;
    fc.assert(
      fc.property(fc.stringMatching(/^[0-9A-Z]{1,20}$/), (body) => {
        expect(iso7064PureCheck(body, system)).toBe(cdigit.mod1271_36.compute(body));
      }),
    );
  });
});
