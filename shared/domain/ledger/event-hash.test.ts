import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { canonicalize as referenceCanonicalize } from 'json-canonicalize';
import {
  computeEventHash,
  EventFormatError,
  eventHashBody,
  eventHashInput,
  GENESIS_HASH,
  verifyChain,
  type HashedEvent,
  type LedgerEvent,
} from './event-hash';

// The two-event chain worked through in docs/ledger-format.md; invented demo values.
const FIRST: HashedEvent = {
  v: 1,
  item: 'S26-00157-K',
  seq: 1,
  type: 'registered',
  actor: { kind: 'user', id: 7 },
  station: 'SAW-1',
  container: null,
  occurredAt: '2026-12-01T09:58:12.345Z',
  recordedAt: '2026-12-01T09:58:13.002Z',
  payload: { sample: 'M26-0042', geometry: 'flat' },
  idempotencyKey: '5b1e2a7c-3f0d-4c39-9a51-2d6f3e8b9c10',
  corrects: null,
  signature: null,
  prevHash: GENESIS_HASH,
};
const FIRST_CANONICAL =
  '{"actor":{"id":7,"kind":"user"},"container":null,"corrects":null,' +
  '"idempotencyKey":"5b1e2a7c-3f0d-4c39-9a51-2d6f3e8b9c10","item":"S26-00157-K",' +
  '"occurredAt":"2026-12-01T09:58:12.345Z","payload":{"geometry":"flat","sample":"M26-0042"},' +
  '"prevHash":"0000000000000000000000000000000000000000000000000000000000000000",' +
  '"recordedAt":"2026-12-01T09:58:13.002Z","seq":1,"signature":null,"station":"SAW-1","type":"registered","v":1}';
const FIRST_HASH = 'd76cda63d4fd6e6e0ce88d4b9190b9fe4759dcf5b08abe1c6aba5cc3a00118dc';
const SECOND: HashedEvent = {
  ...FIRST,
  seq: 2,
  type: 'cut',
  occurredAt: '2026-12-01T10:00:00.000Z',
  recordedAt: '2026-12-01T10:00:00.481Z',
  payload: {},
  idempotencyKey: 'c0a8f1d2-6e4b-4b7a-8d3c-91e5f7a2b604',
  prevHash: FIRST_HASH,
};
const SECOND_HASH = 'e329b8e5e1c65806ab2338162b0957098fa36e1f8ae250ef45a41114088d03fb';

/** Random JSON payloads; __proto__ members are refused on purpose and tested separately. */
const jsonPayload = fc
  .dictionary(fc.string(), fc.jsonValue())
  .filter((payload) => !JSON.stringify(payload).includes('"__proto__":'));

/** Independent path: json-canonicalize and node:crypto instead of our canonicaliser and SHA-256. */
function referenceHash(body: HashedEvent): string {
  return createHash('sha256').update(referenceCanonicalize(body), 'utf8').digest('hex');
}

/** Builds a valid chain for one item with the given event types. */
function chainOf(item: string, types: string[], startMinute = 0): LedgerEvent[] {
  const chain: LedgerEvent[] = [];
  let prevHash = GENESIS_HASH;
  types.forEach((type, index) => {
    const at = new Date(Date.UTC(2026, 11, 1, 8, startMinute + index)).toISOString();
    const body: HashedEvent = {
      ...FIRST,
      item,
      seq: index + 1,
      type,
      occurredAt: at,
      recordedAt: at,
      payload: {},
      idempotencyKey: `${item}-${index + 1}`,
      prevHash,
    };
    const hash = computeEventHash(body);
    chain.push({ ...body, hash });
    prevHash = hash;
  });
  return chain;
}

describe('eventHashInput and computeEventHash', () => {
  it('gives the canonical bytes and hashes written in docs/ledger-format.md', () => {
    expect(eventHashInput(FIRST)).toBe(FIRST_CANONICAL);
    expect(new TextEncoder().encode(FIRST_CANONICAL).length).toBe(419);
    expect(computeEventHash(FIRST)).toBe(FIRST_HASH);
    expect(computeEventHash(SECOND)).toBe(SECOND_HASH);
  });

  it('matches json-canonicalize + node:crypto for the worked example', () => {
    expect(referenceHash(FIRST)).toBe(FIRST_HASH);
    expect(referenceHash(SECOND)).toBe(SECOND_HASH);
  });

  it('matches json-canonicalize + node:crypto for random payloads', () => {
    fc.assert(
      fc.property(jsonPayload, fc.integer({ min: 1, max: 10_000 }), (payload, seq) => {
        const body = { ...FIRST, seq, payload } as HashedEvent;
        expect(computeEventHash(body)).toBe(referenceHash(body));
      }),
      { numRuns: 200 },
    );
  });

  it('leaves extra members such as hash or a row id out of the body', () => {
    const stored = { ...FIRST, hash: FIRST_HASH, id: 99 } as HashedEvent;
    expect(Object.keys(eventHashBody(stored)).sort()).toEqual(Object.keys(FIRST).sort());
    expect(computeEventHash(stored)).toBe(FIRST_HASH);
  });

  it('refuses a __proto__ member anywhere in the payload', () => {
    // JSON.parse makes "__proto__" an ordinary member, but copying with assignment turns it
    // into a prototype and drops it from the hash input.
    const payload = JSON.parse('{"results":[{"__proto__":{"x":1}}]}') as HashedEvent['payload'];
    expect(() => computeEventHash({ ...FIRST, payload })).toThrow(/payload\.results\[0\]\.__proto__/);
  });

  it('hashes the members given, not a copy that lost some', () => {
    fc.assert(
      fc.property(jsonPayload, (payload) => {
        const body = { ...FIRST, payload } as HashedEvent;
        expect(eventHashBody(body).payload).toBe(payload);
      }),
      { numRuns: 50 },
    );
  });

  it('changes when any hashed member changes', () => {
    const variants: HashedEvent[] = [
      { ...FIRST, seq: 2 },
      { ...FIRST, actor: { kind: 'instrument', id: 7 } },
      { ...FIRST, station: null },
      { ...FIRST, container: 'BIN-A' },
      { ...FIRST, occurredAt: '2026-12-01T09:58:12.346Z' },
      { ...FIRST, payload: { sample: 'M26-0042', geometry: 'round' } },
      { ...FIRST, signature: { signer: 3, meaning: 'approved', signedAt: '2026-12-01T09:58:13.000Z' } },
      { ...FIRST, corrects: 'a'.repeat(64) },
    ];
    for (const variant of variants) expect(computeEventHash(variant)).not.toBe(FIRST_HASH);
  });

  it.each([
    ['a missing member', { ...FIRST, corrects: undefined }, 'corrects'],
    ['an undefined payload member', { ...FIRST, payload: { reason: undefined } }, 'payload'],
    ['a time without milliseconds', { ...FIRST, occurredAt: '2026-12-01T10:00:00Z' }, 'occurredAt'],
    ['a time with an offset', { ...FIRST, recordedAt: '2026-12-01T10:00:00.000+01:00' }, 'recordedAt'],
    ['an impossible date', { ...FIRST, recordedAt: '2026-02-29T10:00:00.000Z' }, 'recordedAt'],
    ['seq 0', { ...FIRST, seq: 0 }, 'seq'],
    ['a fractional actor id', { ...FIRST, actor: { kind: 'user', id: 1.5 } }, 'actor.id'],
    ['an uppercase prevHash', { ...FIRST, prevHash: 'A'.repeat(64) }, 'prevHash'],
    ['a NaN in the payload', { ...FIRST, payload: { width: NaN } }, 'payload'],
    ['another version', { ...FIRST, v: 2 }, 'v'],
  ])('refuses %s, naming the member', (_label, body, member) => {
    let caught: unknown;
    try {
      computeEventHash(body as HashedEvent);
    } catch (error) {
      caught = error;
    }
    expect(caught).toBeInstanceOf(EventFormatError);
    expect((caught as EventFormatError).issues.join(' ')).toContain(member);
  });
});

describe('verifyChain', () => {
  it('accepts the worked example and reports its head', () => {
    const result = verifyChain([
      { ...FIRST, hash: FIRST_HASH },
      { ...SECOND, hash: SECOND_HASH },
    ]);
    expect(result).toEqual({
      ok: true,
      eventsChecked: 2,
      heads: [{ item: 'S26-00157-K', seq: 2, hash: SECOND_HASH }],
    });
  });

  it('accepts interleaved chains of several items and sorts heads by code', () => {
    const b = chainOf('S26-00158-F', ['registered', 'cut', 'measured']);
    const a = chainOf('S26-00157-K', ['registered', 'cut']);
    const result = verifyChain([b[0], a[0], b[1], a[1], b[2]]);
    expect(result.ok).toBe(true);
    if (result.ok) expect(result.heads.map((head) => [head.item, head.seq])).toEqual([
      ['S26-00157-K', 2],
      ['S26-00158-F', 3],
    ]);
  });

  it('accepts an empty ledger', () => {
    expect(verifyChain([])).toEqual({ ok: true, eventsChecked: 0, heads: [] });
  });

  it('names an edited payload as a hash mismatch at that event', () => {
    const chain = chainOf('S26-00157-K', ['registered', 'cut', 'measured', 'tested']);
    chain[2] = { ...chain[2], payload: { widthMm: 12.5 } };
    const result = verifyChain(chain);
    expect(result).toMatchObject({
      ok: false,
      eventsChecked: 2,
      firstBreak: { eventIndex: 2, item: 'S26-00157-K', seq: 3, reason: 'hash-mismatch', actual: chain[2].hash },
    });
  });

  it('names a rehashed edit as a prev-hash mismatch at the next event', () => {
    const chain = chainOf('S26-00157-K', ['registered', 'cut', 'measured', 'tested']);
    const edited = { ...chain[1], occurredAt: '2026-12-01T07:00:00.000Z' };
    chain[1] = { ...edited, hash: computeEventHash(edited) };
    const result = verifyChain(chain);
    expect(result).toMatchObject({
      ok: false,
      firstBreak: { eventIndex: 2, seq: 3, reason: 'prev-hash-mismatch', actual: chain[2].prevHash, expected: chain[1].hash },
    });
  });

  it('names a deleted event as a seq gap', () => {
    const chain = chainOf('S26-00157-K', ['registered', 'cut', 'measured']);
    const result = verifyChain([chain[0], chain[2]]);
    expect(result).toMatchObject({ ok: false, firstBreak: { eventIndex: 1, reason: 'seq-gap', expected: 2, actual: 3 } });
  });

  it('names a repeated event as a seq repeat', () => {
    const chain = chainOf('S26-00157-K', ['registered', 'cut']);
    const result = verifyChain([chain[0], chain[1], chain[1]]);
    expect(result).toMatchObject({ ok: false, firstBreak: { eventIndex: 2, reason: 'seq-repeat', expected: 3, actual: 2 } });
  });

  it('requires the genesis hash before seq 1', () => {
    const [first] = chainOf('S26-00157-K', ['registered']);
    const body = { ...first, prevHash: 'f'.repeat(64) };
    const result = verifyChain([{ ...body, hash: computeEventHash(body) }]);
    expect(result).toMatchObject({ ok: false, firstBreak: { reason: 'prev-hash-mismatch', expected: GENESIS_HASH } });
  });

  it('names a malformed event', () => {
    const [first] = chainOf('S26-00157-K', ['registered']);
    const result = verifyChain([{ ...first, recordedAt: '2026-12-01 08:00' }]);
    expect(result).toMatchObject({ ok: false, firstBreak: { eventIndex: 0, reason: 'invalid-event' } });
    if (!result.ok) expect(result.firstBreak.actual).toContain('recordedAt');
    const badHash = verifyChain([{ ...first, hash: first.hash.toUpperCase() }]);
    expect(badHash).toMatchObject({ ok: false, firstBreak: { reason: 'invalid-event' } });
  });

  it('requires corrects to name an earlier event of the same item', () => {
    const chain = chainOf('S26-00157-K', ['registered', 'cut']);
    const other = chainOf('S26-00158-F', ['registered']);
    const good = { ...chain[1], seq: 3, type: 'voided', prevHash: chain[1].hash, corrects: chain[1].hash };
    expect(verifyChain([...chain, { ...good, hash: computeEventHash(good) }]).ok).toBe(true);
    const stray = { ...good, corrects: other[0].hash };
    const result = verifyChain([...other, ...chain, { ...stray, hash: computeEventHash(stray) }]);
    expect(result).toMatchObject({ ok: false, firstBreak: { eventIndex: 3, reason: 'void-target-unknown' } });
  });
});
