import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { sha256, sha256Hex, sha256HexOfText, toHex, useNativeSha256 } from './sha256';

// The test runs in Node only, so it may use node:crypto as an independent reference.
function nodeSha256Hex(bytes: Uint8Array): string {
  return createHash('sha256').update(bytes).digest('hex');
}

describe('sha256', () => {
  it('hashes "abc" (FIPS 180 one-block example)', () => {
    // Source: FIPS 180 examples, CHECKS.md "Canonical JSON and hashes" [copy][run].
    expect(sha256HexOfText('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
  });

  it('hashes the 448-bit message (FIPS 180 two-block example)', () => {
    // Source: FIPS 180 examples, CHECKS.md [copy][run].
    expect(sha256HexOfText('abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq')).toBe(
      '248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1',
    );
  });

  it('hashes one million "a"', () => {
    // Source: FIPS 180 examples, CHECKS.md [copy][run].
    expect(sha256Hex(new Uint8Array(1_000_000).fill(0x61))).toBe(
      'cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0',
    );
  });

  it('hashes the empty string', () => {
    // Source: node:crypto as the reference; the value is also widely published (from memory).
    expect(sha256HexOfText('')).toBe('e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855');
  });

  it('agrees with node:crypto at every length around the padding boundaries', () => {
    // Lengths 0–200 cover 55/56 bytes (length field spills into a second block) and 63/64/65.
    for (let length = 0; length <= 200; length++) {
      const bytes = Uint8Array.from({ length }, (_, i) => (i * 31 + length) & 0xff);
      expect(sha256Hex(bytes)).toBe(nodeSha256Hex(bytes));
    }
  });

  it('agrees with node:crypto on random byte strings and UTF-8 text', () => {
    fc.assert(
      fc.property(fc.uint8Array({ maxLength: 1000 }), (bytes) => {
        expect(sha256Hex(bytes)).toBe(nodeSha256Hex(bytes));
      }),
    );
    fc.assert(
      fc.property(fc.string({ unit: 'grapheme' }), (text) => {
        expect(sha256HexOfText(text)).toBe(createHash('sha256').update(text, 'utf8').digest('hex'));
      }),
    );
  });

  it('returns 32 bytes, and toHex writes two lowercase digits per byte', () => {
    expect(sha256(new Uint8Array()).length).toBe(32);
    expect(toHex(Uint8Array.from([0, 10, 255]))).toBe('000aff');
  });
});

describe('useNativeSha256', () => {
  it('gives the same digests as the pure implementation once a native one is registered', () => {
    const samples = ['', 'abc', 'a'.repeat(1000), '{"item":"S26-00157-W","seq":1}'];
    const pure = samples.map((s) => sha256HexOfText(s));
    useNativeSha256((m) => createHash('sha256').update(m).digest('hex'));
    // Source: FIPS 180-4 example "abc" (CHECKS.md), checked through the registered implementation.
    expect(sha256HexOfText('abc')).toBe('ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad');
    expect(samples.map((s) => sha256HexOfText(s))).toEqual(pure);
  });
});
