import { createHash } from 'node:crypto';
import { describe, expect, it } from 'vitest';
import { canonicalize as referenceCanonicalize } from 'json-canonicalize';
import { computeEventHash, GENESIS_HASH, type HashedEvent, type LedgerEvent } from './event-hash';
import { computeSeal, computeSealHash, dayEnd, nextDay, sealHeads, verifySeals, type Seal } from './seal';

// Invented demo events. Each item's chain is built with real hashes.
function event(item: string, seq: number, recordedAt: string, prevHash: string): LedgerEvent {
  const body: HashedEvent = {
    v: 1,
    item,
    seq,
    type: seq === 1 ? 'registered' : 'cut',
    actor: { kind: 'instrument', id: 2 },
    station: null,
    container: null,
    occurredAt: recordedAt,
    recordedAt,
    payload: {},
    idempotencyKey: `${item}/${seq}`,
    corrects: null,
    signature: null,
    prevHash,
  };
  return { ...body, hash: computeEventHash(body) };
}

function chain(item: string, times: string[]): LedgerEvent[] {
  const events: LedgerEvent[] = [];
  times.forEach((at, i) => events.push(event(item, i + 1, at, i === 0 ? GENESIS_HASH : events[i - 1].hash)));
  return events;
}

const K = chain('S26-00157-K', ['2026-12-01T09:00:00.000Z', '2026-12-01T23:59:59.999Z', '2026-12-02T00:00:00.000Z']);
const F = chain('S26-00158-F', ['2026-12-02T10:00:00.000Z', '2026-12-03T10:00:00.000Z']);
const C = chain('C26-00003-Q', ['2026-11-30T12:00:00.000Z']);
const LEDGER = [...K, ...F, ...C];

function sealRun(days: string[], events: readonly LedgerEvent[]): Seal[] {
  const seals: Seal[] = [];
  for (const day of days) seals.push(computeSeal(day, events, seals.at(-1)?.hash ?? GENESIS_HASH));
  return seals;
}

describe('dayEnd and nextDay', () => {
  it('gives the next UTC midnight, across month, year and leap-day ends', () => {
    expect(dayEnd('2026-12-01')).toBe('2026-12-02T00:00:00.000Z');
    expect(dayEnd('2026-12-31')).toBe('2027-01-01T00:00:00.000Z');
    expect(nextDay('2028-02-28')).toBe('2028-02-29');
    expect(nextDay('2027-02-28')).toBe('2027-03-01');
  });

  it('refuses days that do not exist or are written otherwise', () => {
    for (const day of ['2026-02-29', '2026-13-01', '2026-1-01', '20261201', '2026-12-01T00:00:00.000Z']) {
      expect(() => dayEnd(day)).toThrow(RangeError);
    }
  });
});

describe('sealHeads and computeSeal', () => {
  it('takes each item’s last event recorded before the next day’s midnight', () => {
    expect(sealHeads('2026-12-01', LEDGER)).toEqual([
      { item: 'C26-00003-Q', seq: 1, hash: C[0].hash },
      // 23:59:59.999Z is inside the day; 00:00:00.000Z the next day is not.
      { item: 'S26-00157-K', seq: 2, hash: K[1].hash },
    ]);
    expect(sealHeads('2026-12-02', LEDGER).map((h) => [h.item, h.seq])).toEqual([
      ['C26-00003-Q', 1],
      ['S26-00157-K', 3],
      ['S26-00158-F', 1],
    ]);
  });

  it('does not depend on the order the events come in', () => {
    expect(sealHeads('2026-12-03', [...LEDGER].reverse())).toEqual(sealHeads('2026-12-03', LEDGER));
  });

  it('sorts by UTF-16 code units, not by locale', () => {
    const a = chain('a-1', ['2026-12-01T01:00:00.000Z']);
    const b = chain('B-1', ['2026-12-01T01:00:00.000Z']);
    // "B" (0x42) sorts before "a" (0x61) in code units; localeCompare would put "a" first.
    expect(sealHeads('2026-12-01', [...a, ...b]).map((h) => h.item)).toEqual(['B-1', 'a-1']);
  });

  it('seals an empty ledger with no heads', () => {
    const seal = computeSeal('2026-12-01', [], GENESIS_HASH);
    expect(seal.heads).toEqual([]);
    expect(seal.prevSeal).toBe(GENESIS_HASH);
  });

  it('hashes the canonical body, as json-canonicalize + node:crypto do', () => {
    const seal = computeSeal('2026-12-02', LEDGER, 'ab'.repeat(32));
    const { hash, ...body } = seal;
    expect(Object.keys(body).sort()).toEqual(['day', 'heads', 'prevSeal', 'v']);
    expect(hash).toBe(createHash('sha256').update(referenceCanonicalize(body), 'utf8').digest('hex'));
    expect(computeSealHash(body)).toBe(hash);
  });

  it('gives the seal hash written in docs/ledger-format.md', () => {
    // The two-event chain of the worked example (see event-hash.test.ts) sealed on its day;
    // the hash was also checked with sha256sum over the canonical body.
    const head = 'e329b8e5e1c65806ab2338162b0957098fa36e1f8ae250ef45a41114088d03fb';
    const events = [
      { item: 'S26-00157-K', seq: 1, hash: 'd76cda63d4fd6e6e0ce88d4b9190b9fe4759dcf5b08abe1c6aba5cc3a00118dc', recordedAt: '2026-12-01T09:58:13.002Z' },
      { item: 'S26-00157-K', seq: 2, hash: head, recordedAt: '2026-12-01T10:00:00.481Z' },
    ];
    const seal = computeSeal('2026-12-01', events, GENESIS_HASH);
    expect(seal.heads).toEqual([{ item: 'S26-00157-K', seq: 2, hash: head }]);
    expect(seal.hash).toBe('ecf7a7d54b771a990106a3de541f10d348b9425fbf868a4c0982b869ae0ab6e0');
  });

  it('refuses an event with a malformed recordedAt', () => {
    expect(() => sealHeads('2026-12-01', [{ ...K[0], recordedAt: '2026-12-01 09:00' }])).toThrow(/recordedAt/);
  });
});

describe('verifySeals', () => {
  const DAYS = ['2026-11-30', '2026-12-01', '2026-12-02', '2026-12-03'];

  it('accepts a run of seals that matches the ledger', () => {
    expect(verifySeals(sealRun(DAYS, LEDGER), LEDGER)).toEqual({ ok: true, sealsChecked: 4 });
  });

  it('names a deleted chain as missing', () => {
    const seals = sealRun(DAYS, LEDGER);
    const result = verifySeals(seals, [...K, ...C]);
    expect(result).toMatchObject({
      ok: false,
      sealsChecked: 2,
      firstBreak: {
        sealIndex: 2,
        day: '2026-12-02',
        reason: 'heads-differ',
        items: [{ item: 'S26-00158-F', change: 'missing', sealed: { seq: 1, hash: F[0].hash }, recomputed: null }],
      },
    });
  });

  it('names deleted last events as a changed head', () => {
    const result = verifySeals(sealRun(DAYS, LEDGER), [...K.slice(0, 2), ...F, ...C]);
    expect(result).toMatchObject({
      ok: false,
      firstBreak: {
        day: '2026-12-02',
        items: [{ item: 'S26-00157-K', change: 'changed', sealed: { seq: 3 }, recomputed: { seq: 2 } }],
      },
    });
  });

  it('names a back-dated insert as unsealed', () => {
    const seals = sealRun(DAYS, LEDGER);
    const sneaked = chain('S26-00199-M', ['2026-12-01T08:00:00.000Z']);
    const result = verifySeals(seals, [...LEDGER, ...sneaked]);
    expect(result).toMatchObject({
      ok: false,
      firstBreak: { day: '2026-12-01', items: [{ item: 'S26-00199-M', change: 'unsealed', sealed: null }] },
    });
  });

  it('names an edited seal as a seal hash mismatch', () => {
    const seals = sealRun(DAYS, LEDGER);
    seals[1] = { ...seals[1], heads: seals[1].heads.slice(1) };
    expect(verifySeals(seals, LEDGER)).toMatchObject({
      ok: false,
      firstBreak: { sealIndex: 1, reason: 'seal-hash-mismatch', actual: seals[1].hash },
    });
  });

  it('names a rewritten and rehashed seal at the next seal’s prevSeal', () => {
    const shortened = sealRun(DAYS, [...K, ...C]);
    const seals = sealRun(DAYS, LEDGER);
    seals[2] = shortened[2];
    // The rewritten seal agrees with its own hash and with the shortened ledger; the seal
    // after it still names the original, so the break shows there.
    const result = verifySeals(seals, [...K, ...C]);
    expect(result).toMatchObject({
      ok: false,
      firstBreak: { sealIndex: 3, day: '2026-12-03', reason: 'prev-seal-mismatch', expected: shortened[2].hash },
    });
  });

  it('requires one seal per day, in order', () => {
    const seals = sealRun(DAYS, LEDGER);
    expect(verifySeals([seals[0], seals[2]], LEDGER)).toMatchObject({
      ok: false,
      firstBreak: { sealIndex: 1, reason: 'day-gap', expected: '2026-12-01', actual: '2026-12-02' },
    });
    expect(verifySeals([seals[1], seals[0]], LEDGER, { firstPrevSeal: seals[0].hash })).toMatchObject({
      ok: false,
      firstBreak: { sealIndex: 1, reason: 'day-out-of-order' },
    });
  });

  it('names a malformed seal', () => {
    const seals = sealRun(DAYS, LEDGER);
    const result = verifySeals([{ ...seals[0], day: '30/11/2026' }], LEDGER);
    expect(result).toMatchObject({ ok: false, firstBreak: { reason: 'invalid-seal' } });
  });

  it('catches heads listed out of code order even when the seal hashes', () => {
    const [seal] = sealRun(['2026-12-02'], LEDGER);
    const body = { v: 1 as const, day: seal.day, heads: [...seal.heads].reverse(), prevSeal: GENESIS_HASH };
    const result = verifySeals([{ ...body, hash: computeSealHash(body) }], LEDGER);
    expect(result).toMatchObject({ ok: false, firstBreak: { reason: 'heads-differ', items: [] } });
  });

  it('can check some items from mid-way, as an audit pack needs', () => {
    const seals = sealRun(DAYS, LEDGER);
    const options = { firstPrevSeal: seals[1].hash, items: ['S26-00157-K'] };
    expect(verifySeals(seals.slice(2), K, options)).toEqual({ ok: true, sealsChecked: 2 });
    expect(verifySeals(seals.slice(2), K.slice(0, 2), options)).toMatchObject({
      ok: false,
      firstBreak: { items: [{ item: 'S26-00157-K', change: 'changed' }] },
    });
    expect(verifySeals(seals.slice(2), K)).toMatchObject({ ok: false, firstBreak: { reason: 'prev-seal-mismatch' } });
  });
});
