import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { canonicalize as referenceCanonicalize } from 'json-canonicalize';
import { CanonicalJsonError, canonicalBytes, canonicalJson } from './canonical';

/** Builds a double from its IEEE-754 bit pattern, as RFC 8785 Appendix B lists them. */
function fromIeeeHex(hex: string): number {
  const view = new DataView(new ArrayBuffer(8));
  view.setBigUint64(0, BigInt(`0x${hex}`));
  return view.getFloat64(0);
}

describe('canonicalJson', () => {
  it('canonicalises the RFC 8785 §3.2.2 sample to the §3.2.4 output, 118 UTF-8 bytes', () => {
    // Source: RFC 8785 §3.2.2 (input) and §3.2.4 (output); CHECKS.md "Canonical JSON and hashes" [copy][run].
    const input = String.raw`{"numbers":[333333333.33333329,1E30,4.50,2e-3,0.000000000000000000000000001],"string":"\u20ac$\u000F\u000aA'\u0042\u0022\u005c\\\"\/","literals":[null,true,false]}`;
    const expected = String.raw`{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\u000f\nA'B\"\\\\\"/"}`;
    const parsed: unknown = JSON.parse(input);
    expect(canonicalJson(parsed)).toBe(expected);
    expect(canonicalBytes(parsed).length).toBe(118);
    expect(canonicalJson(parsed)).toBe(referenceCanonicalize(parsed));
  });

  it('orders members by UTF-16 code units (RFC 8785 §3.2.3)', () => {
    // Source: RFC 8785 §3.2.3 sorting example; CHECKS.md [copy][run]. The member values are
    // recalled from memory; the order of the keys is what the check is about.
    const input = String.raw`{"\u20ac":"Euro Sign","\r":"Carriage Return","\ufb33":"Hebrew Letter Dalet With Dagesh","1":"One","\ud83d\ude00":"Emoji: Grinning Face","\u0080":"Control","\u00f6":"Latin Small Letter O With Diaeresis"}`;
    const expected =
      '{"\\r":"Carriage Return","1":"One","\u0080":"Control","\u00f6":"Latin Small Letter O With Diaeresis",' +
      '"\u20ac":"Euro Sign","\ud83d\ude00":"Emoji: Grinning Face","\ufb33":"Hebrew Letter Dalet With Dagesh"}';
    const parsed: unknown = JSON.parse(input);
    // Compare strings: JSON.parse would put the integer-like key "1" first again.
    expect(canonicalJson(parsed)).toBe(expected);
    expect(canonicalJson(parsed)).toBe(referenceCanonicalize(parsed));
  });

  it('puts U+1F600 (surrogates D83D DE00) before U+FB33, unlike code-point order', () => {
    // Source: RFC 8785 §3.2.3 — sorting is on UTF-16 code units, so the emoji's high surrogate
    // 0xD83D sorts before 0xFB33 although its code point is larger.
    const text = canonicalJson({ '\ufb33': 1, '\u{1f600}': 2 });
    expect(text.indexOf('\u{1f600}')).toBeLessThan(text.indexOf('\ufb33'));
  });

  it.each([
    // Source: RFC 8785 Appendix B (IEEE-754 hex → canonical text); CHECKS.md [copy][run].
    ['0000000000000001', '5e-324'],
    ['4340000000000000', '9007199254740992'],
    ['44b52d02c7e14af6', '1e+23'],
    ['3eb0c6f7a0b5ed8c', '9.999999999999997e-7'],
    ['3eb0c6f7a0b5ed8d', '0.000001'],
    ['8000000000000000', '0'],
  ])('writes the double %s as %s (RFC 8785 Appendix B)', (hex, text) => {
    const value = fromIeeeHex(hex);
    expect(canonicalJson(value)).toBe(text);
    expect(canonicalJson([value])).toBe(`[${text}]`);
  });

  it.each([
    ['NaN', NaN, '$'],
    ['Infinity', Infinity, '$'],
    ['-Infinity', -Infinity, '$'],
    ['NaN in a member', { a: { b: NaN } }, '$.a.b'],
    ['Infinity in an array', [1, Infinity], '$[1]'],
    ['undefined', undefined, '$'],
    ['an undefined member', { reason: undefined }, '$.reason'],
    ['an undefined array element', [undefined], '$[0]'],
    ['a function', { f: () => 1 }, '$.f'],
    ['a symbol', { s: Symbol('x') }, '$.s'],
    ['a bigint', { n: 10n }, '$.n'],
    ['a Date', { at: new Date(0) }, '$.at'],
    ['a Map', new Map(), '$'],
    ['a sparse array', [1, , 3], '$[1]'],
    ['a lone surrogate', { 'odd key': '\ud800' }, '$["odd key"]'],
  ])('refuses %s with an error that names where', (_label, value, path) => {
    // RFC 8785 §3.2.2.2: NaN and Infinity must cause an error; undefined, functions and the rest
    // are not JSON at all, and the canonicalize package would otherwise drop them silently.
    let caught: unknown;
    try {
      canonicalJson(value);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(CanonicalJsonError);
    expect((caught as CanonicalJsonError).path).toBe(path);
  });

  it('refuses a value that refers to itself', () => {
    const loop: Record<string, unknown> = {};
    loop.self = loop;
    expect(() => canonicalJson(loop)).toThrow(/refers to itself/);
  });

  it('accepts the same object twice when it is not a cycle', () => {
    const shared = { a: 1 };
    expect(canonicalJson({ x: shared, y: shared })).toBe('{"x":{"a":1},"y":{"a":1}}');
  });

  it('accepts objects without a prototype', () => {
    const bare = Object.create(null) as Record<string, unknown>;
    bare.b = 2;
    bare.a = 1;
    expect(canonicalJson(bare)).toBe('{"a":1,"b":2}');
  });

  it('agrees with json-canonicalize on random JSON values, and is a fixed point', () => {
    // Second reference implementation: the json-canonicalize npm package.
    fc.assert(
      fc.property(fc.jsonValue(), (value) => {
        const ours = canonicalJson(value);
        expect(ours).toBe(referenceCanonicalize(value));
        expect(canonicalJson(JSON.parse(ours))).toBe(ours);
      }),
      { numRuns: 500 },
    );
  });
});
