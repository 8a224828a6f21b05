import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import * as cdigit from 'cdigit';
import {
  BADGE_ALPHABET,
  CODE_KINDS,
  CodeSchema,
  badgeCode,
  codePatternHint,
  codeSchemaFor,
  containerCode,
  describeCodePattern,
  formatCode,
  halfCode,
  normalizeCode,
  parseCode,
  specimenCode,
} from './codes';

const CHECK_ALPHABET = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ*';

/** Any valid Halfmark code, in display form. */
const anyCode: fc.Arbitrary<string> = fc.oneof(
  fc
    .tuple(fc.integer({ min: 0, max: 99 }), fc.integer({ min: 0, max: 999_999_999 }))
    .map(([y, s]) => specimenCode(y, s)),
  fc
    .tuple(
      fc.integer({ min: 2000, max: 2099 }),
      fc.integer({ min: 0, max: 999_999_999 }),
      fc.constantFrom<'A' | 'B'>('A', 'B'),
    )
    .map(([y, s, h]) => halfCode(specimenCode(y, s), h)),
  fc.integer({ min: 0, max: 999_999_999 }).map((s) => containerCode(s)),
  fc
    .array(fc.double({ min: 0, max: 1, maxExcluded: true, noNaN: true }), { minLength: 6, maxLength: 6 })
    .map((rs) => {
      let i = 0;
      return badgeCode(() => rs[i++] ?? 0);
    }),
);

describe('making codes', () => {
  it('makes a specimen code whose check is MOD 37-2 over the compact form', () => {
    // Check character from cdigit's ISO/IEC 7064 MOD 37-2 (an independent implementation).
    expect(cdigit.mod37_2.compute('S2600157')).toBe('W');
    expect(specimenCode(2026, 157)).toBe('S26-00157-W');
    expect(specimenCode(26, 157)).toBe('S26-00157-W');
    expect(specimenCode(2030, 1_234_567)).toBe(`S30-1234567-${cdigit.mod37_2.compute('S301234567')}`);
  });

  it('makes half codes from the specimen body plus A or B', () => {
    expect(cdigit.mod37_2.compute('S2600157A')).toBe('6');
    expect(cdigit.mod37_2.compute('S2600157B')).toBe('4');
    expect(halfCode('S26-00157-W', 'A')).toBe('S26-00157A-6');
    expect(halfCode('s2600157w', 'B')).toBe('S26-00157B-4');
  });

  it('refuses to make a half from anything but a valid specimen code', () => {
    expect(() => halfCode('S26-00157-X', 'A')).toThrow(/check character/);
    expect(() => halfCode('C-00042-R', 'A')).toThrow(/not a container code/);
    expect(() => halfCode('S26-00157A-6', 'B')).toThrow(/not a half code/);
  });

  it('makes container codes', () => {
    expect(cdigit.mod37_2.compute('C00042')).toBe('R');
    expect(containerCode(42)).toBe('C-00042-R');
  });

  it('makes badge codes from the unambiguous alphabet', () => {
    expect(BADGE_ALPHABET).toHaveLength(32);
    expect(BADGE_ALPHABET).not.toMatch(/[IO01]/);
    const code = badgeCode(() => 0);
    expect(code).toBe(`U-222222-${cdigit.mod37_2.compute('U222222')}`);
    fc.assert(
      fc.property(fc.constant(null), () => {
        const random = badgeCode();
        expect(random).toMatch(/^U-[2-9A-HJ-NP-Z]{6}-[0-9A-Z*]$/);
        expect(parseCode(random)).toMatchObject({ ok: true, kind: 'badge' });
      }),
      { numRuns: 200 },
    );
  });

  it('refuses out-of-range inputs', () => {
    expect(() => specimenCode(150, 1)).toThrow(RangeError);
    expect(() => specimenCode(26, -1)).toThrow(RangeError);
    expect(() => specimenCode(26, 1.5)).toThrow(RangeError);
    expect(() => containerCode(1_000_000_000)).toThrow(RangeError);
    expect(() => badgeCode(() => 1)).toThrow(RangeError);
  });

  it('can produce * as the check character, read aloud as "star"', () => {
    const serial = Array.from({ length: 400 }, (_, i) => i).find(
      (s) => cdigit.mod37_2.compute(`C${String(s).padStart(5, '0')}`) === '*',
    );
    expect(serial).toBeDefined();
    const code = containerCode(serial ?? 0);
    expect(code.endsWith('-*')).toBe(true);
    expect(parseCode(code)).toMatchObject({ ok: true, kind: 'container', code });
  });
});

describe('normalizeCode and formatCode', () => {
  it('trims, upper-cases and strips spaces and hyphens', () => {
    expect(normalizeCode('  s26-00157-w \r\n')).toBe('S2600157W');
    expect(normalizeCode('S26 00157 W')).toBe('S2600157W');
    expect(normalizeCode('S26\u201100157\u2013W')).toBe('S2600157W');
  });

  it('writes the display form of each kind', () => {
    expect(formatCode('S2600157W')).toBe('S26-00157-W');
    expect(formatCode('S2600157A6')).toBe('S26-00157A-6');
    expect(formatCode('C00042R')).toBe('C-00042-R');
    expect(formatCode('UK7MP3QZ')).toBe('U-K7MP3Q-Z');
    expect(() => formatCode('X123')).toThrow(RangeError);
  });
});

describe('parseCode', () => {
  it('reads each kind', () => {
    expect(parseCode('S26-00157-W')).toEqual({
      ok: true,
      kind: 'specimen',
      code: 'S26-00157-W',
      compact: 'S2600157W',
    });
    expect(parseCode('s26 00157a 6')).toEqual({
      ok: true,
      kind: 'half',
      code: 'S26-00157A-6',
      compact: 'S2600157A6',
      specimenCode: 'S26-00157-W',
      half: 'A',
    });
    expect(parseCode('C00042R')).toEqual({ ok: true, kind: 'container', code: 'C-00042-R', compact: 'C00042R' });
    expect(parseCode('u-k7mp3q-z')).toMatchObject({ ok: true, kind: 'badge', code: 'U-K7MP3Q-Z' });
  });

  it('says what is wrong, in words a person can act on', () => {
    expect(parseCode('   ')).toEqual({ ok: false, reason: 'empty', message: 'Scan or type a code.' });
    const check = parseCode('S26-00157-X');
    expect(check).toMatchObject({ ok: false, reason: 'check' });
    expect(check.ok ? '' : check.message).toMatch(/^The check character does not match: a character may be mistyped/);
    const short = parseCode('S26-157-W');
    expect(short).toMatchObject({ ok: false, reason: 'malformed' });
    expect(short.ok ? '' : short.message).toContain('S26-00157-W');
    expect(parseCode('C-42-R')).toMatchObject({ ok: false, reason: 'malformed' });
    const badge = parseCode('U-K7MP3O-Z');
    expect(badge.ok ? '' : badge.message).toMatch(/never I, O, 0 or 1/);
    const foreign = parseCode('0000-0002-1825-0097');
    expect(foreign.ok ? '' : foreign.message).toMatch(/start with S .* C .* or U/);
    const stray = parseCode('S26-00157-W!');
    expect(stray.ok ? '' : stray.message).toMatch(/stray character/);
    const star = parseCode('S26-0*157-W');
    expect(star.ok ? '' : star.message).toMatch(/Only the last character/);
  });

  it('has one code per serial: extra leading zeros are refused', () => {
    const body = 'C000042';
    expect(parseCode(body + cdigit.mod37_2.compute(body))).toMatchObject({ ok: false, reason: 'malformed' });
  });

  it('round-trips every code it makes, in any case and spacing', () => {
    fc.assert(
      fc.property(anyCode, (code) => {
        const parsed = parseCode(code);
        expect(parsed).toMatchObject({ ok: true, code });
        if (!parsed.ok) return;
        expect(formatCode(parsed.compact)).toBe(code);
        expect(parseCode(code.toLowerCase().replace(/-/g, ' '))).toEqual(parsed);
        // The check character covers the compact form, as an independent MOD 37-2 implementation confirms.
        expect(cdigit.mod37_2.validate(parsed.compact)).toBe(true);
      }),
    );
  });

  // ISO/IEC 7064 gives MOD 37-2 (a pure system, prime modulus 37, radix 2) as detecting every
  // single substitution error and every adjacent transposition [from memory of the standard's
  // table of error-detection rates]. Why it holds: a change at a position of weight 2^k alters
  // the weighted sum by d·2^k, and swapping neighbours by d·2^k as well, where 0 < |d| < 37;
  // 37 is prime and does not divide 2^k, so the sum can no longer be ≡ 1 (mod 37).
  it('catches every single-character substitution', () => {
    fc.assert(
      fc.property(anyCode, (code) => {
        const compact = normalizeCode(code);
        for (let i = 0; i < compact.length; i += 1) {
          for (const c of CHECK_ALPHABET) {
            if (c === compact[i]) continue;
            const typo = compact.slice(0, i) + c + compact.slice(i + 1);
            expect(parseCode(typo).ok, typo).toBe(false);
          }
        }
      }),
    );
  });

  it('catches every adjacent transposition', () => {
    fc.assert(
      fc.property(anyCode, (code) => {
        const compact = normalizeCode(code);
        for (let i = 0; i + 1 < compact.length; i += 1) {
          if (compact[i] === compact[i + 1]) continue;
          const typo = compact.slice(0, i) + compact[i + 1] + compact[i] + compact.slice(i + 2);
          expect(parseCode(typo).ok, typo).toBe(false);
          // The same swap typed in the display form is caught too.
          expect(parseCode(formatIfPossible(typo)).ok).toBe(false);
        }
      }),
    );
  });
});

function formatIfPossible(compact: string): string {
  try {
    return formatCode(compact);
  } catch {
    return compact;
  }
}

describe('hints and schemas', () => {
  it('gives a valid example of every kind', () => {
    for (const kind of CODE_KINDS) {
      expect(parseCode(codePatternHint(kind))).toMatchObject({ ok: true, kind });
      expect(describeCodePattern(kind)).toContain(codePatternHint(kind));
    }
  });

  it('CodeSchema accepts any valid code and outputs its display form', () => {
    expect(CodeSchema.parse(' s2600157w ')).toBe('S26-00157-W');
    const bad = CodeSchema.safeParse('S26-00157-X');
    expect(bad.success).toBe(false);
    expect(bad.error?.issues[0]?.message).toMatch(/check character does not match/);
  });

  it('codeSchemaFor limits the kinds', () => {
    const schema = codeSchemaFor('specimen', 'half');
    expect(schema.parse('S26-00157A-6')).toBe('S26-00157A-6');
    const wrong = schema.safeParse('C-00042-R');
    expect(wrong.error?.issues[0]?.message).toBe(
      'C-00042-R is a container code; expected a specimen or half code.',
    );
  });
});
