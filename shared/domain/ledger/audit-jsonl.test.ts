import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { canonicalize as referenceCanonicalize } from 'json-canonicalize';
import { computeEventHash, GENESIS_HASH, type HashedEvent, type LedgerEvent } from './event-hash';
import { computeSeal, type Seal } from './seal';
import { auditEventLine, auditHeaderLine, auditSealLine, verifyAuditJsonl } from './audit-jsonl';
import { sha256HexOfText } from './sha256';

// Invented demo data: a specimen that broke and one of its halves, over two days.
function chain(item: string, steps: [string, string, HashedEvent['payload']][]): LedgerEvent[] {
  const events: LedgerEvent[] = [];
  steps.forEach(([type, at, payload], i) => {
    const body: HashedEvent = {
      v: 1,
      item,
      seq: i + 1,
      type,
      actor: { kind: 'instrument', id: 3 },
      station: 'CELL-1',
      container: null,
      occurredAt: at,
      recordedAt: at,
      payload,
      idempotencyKey: `${item}#${i + 1}`,
      corrects: null,
      signature: null,
      prevHash: events[i - 1]?.hash ?? GENESIS_HASH,
    };
    events.push({ ...body, hash: computeEventHash(body) });
  });
  return events;
}

const SPECIMEN = chain('S26-00157-K', [
  ['registered', '2026-12-01T08:00:00.000Z', {}],
  ['measured', '2026-12-01T22:10:00.000Z', { widthMm: 12.47, thicknessMm: 1.99 }],
  ['tested', '2026-12-02T01:30:00.000Z', { fractured: true }],
]);
const HALF = chain('S26-00157-K-B', [
  ['split_from', '2026-12-02T01:30:00.001Z', { from: 'S26-00157-K', half: 'B', fromEvent: SPECIMEN[2].hash }],
]);
const EVENTS = [...SPECIMEN, ...HALF];

function seals(events: readonly LedgerEvent[]): Seal[] {
  const first = computeSeal('2026-12-01', events, GENESIS_HASH);
  return [first, computeSeal('2026-12-02', events, first.hash)];
}

function exportText(events: readonly LedgerEvent[], sealRun: readonly Seal[], items: string[] | null = null): string {
  const header = auditHeaderLine({ exportedAt: '2026-12-03T09:00:00.000Z', items, firstPrevSeal: GENESIS_HASH });
  return [header, ...events.map(auditEventLine), ...sealRun.map(auditSealLine)].join('\n') + '\n';
}

describe('audit JSONL', () => {
  it('writes each line as canonical JSON with the body and its hash', () => {
    const line = auditEventLine({ ...SPECIMEN[0], id: 41 } as LedgerEvent);
    const parsed = JSON.parse(line) as { record: string; body: HashedEvent; hash: string };
    expect(line).toBe(referenceCanonicalize(parsed));
    expect(parsed.record).toBe('event');
    expect(parsed.hash).toBe(SPECIMEN[0].hash);
    expect(computeEventHash(parsed.body)).toBe(parsed.hash);
    expect(Object.keys(parsed.body)).toHaveLength(14);
  });

  it('verifies a whole export and reports the last seal', () => {
    const run = seals(EVENTS);
    expect(verifyAuditJsonl(exportText(EVENTS, run))).toEqual({
      ok: true,
      eventsChecked: 4,
      sealsChecked: 2,
      lastSeal: { day: '2026-12-02', hash: run[1].hash },
    });
  });

  it('names the line of an edited reading', () => {
    const text = exportText(EVENTS, seals(EVENTS)).replace('"widthMm":12.47', '"widthMm":12.57');
    expect(verifyAuditJsonl(text)).toMatchObject({
      ok: false,
      eventsChecked: 1,
      firstBreak: { line: 3, record: 'event', reason: 'hash-mismatch', item: 'S26-00157-K', seq: 2 },
    });
  });

  it('names a removed event line as a seq gap', () => {
    const lines = exportText(EVENTS, seals(EVENTS)).split('\n');
    lines.splice(2, 1);
    expect(verifyAuditJsonl(lines.join('\n'))).toMatchObject({
      ok: false,
      firstBreak: { line: 3, reason: 'seq-gap', expected: 2, actual: 3 },
    });
  });

  it('names a removed chain at the seal that still lists it', () => {
    const text = exportText(SPECIMEN, seals(EVENTS));
    expect(verifyAuditJsonl(text)).toMatchObject({
      ok: false,
      sealsChecked: 1,
      firstBreak: { line: 6, record: 'seal', reason: 'heads-differ', day: '2026-12-02', items: [{ item: 'S26-00157-K-B', change: 'missing' }] },
    });
  });

  it('checks only the items named in a scoped export', () => {
    const run = seals(EVENTS);
    expect(verifyAuditJsonl(exportText(HALF, run, ['S26-00157-K-B']))).toMatchObject({ ok: true, eventsChecked: 1, sealsChecked: 2 });
    expect(verifyAuditJsonl(exportText(EVENTS, run, ['S26-00157-K-B']))).toMatchObject({
      ok: false,
      firstBreak: { line: 2, reason: 'out-of-scope' },
    });
  });

  it('refuses members outside the hash in an event or a seal body', () => {
    const text = exportText(EVENTS, seals(EVENTS));
    expect(verifyAuditJsonl(text.replace('{"body":{"actor"', '{"body":{"note":"x","actor"'))).toMatchObject({
      ok: false,
      firstBreak: { line: 2, reason: 'invalid-event' },
    });
    expect(verifyAuditJsonl(text.replace('{"body":{"day"', '{"body":{"note":"x","day"'))).toMatchObject({
      ok: false,
      firstBreak: { line: 6, reason: 'invalid-seal' },
    });
  });

  it('refuses a missing header, an unreadable line and an event after the seals', () => {
    const run = seals(EVENTS);
    const text = exportText(EVENTS, run);
    expect(verifyAuditJsonl(text.split('\n').slice(1).join('\n'))).toMatchObject({
      ok: false,
      firstBreak: { line: 1, record: 'header', reason: 'unreadable-line' },
    });
    expect(verifyAuditJsonl(text.replace('"record":"event"', '"record":"evnt"'))).toMatchObject({
      ok: false,
      firstBreak: { line: 2, reason: 'unreadable-line' },
    });
    expect(verifyAuditJsonl(`${text}{oops\n`)).toMatchObject({ ok: false, firstBreak: { line: 8, reason: 'unreadable-line' } });
    expect(verifyAuditJsonl(`${text}${auditEventLine(EVENTS[0])}\n`)).toMatchObject({
      ok: false,
      firstBreak: { line: 8, reason: 'line-out-of-place' },
    });
    expect(verifyAuditJsonl('')).toMatchObject({ ok: false, firstBreak: { line: 1, record: 'header' } });
  });
});

describe('docs/ledger-format.md', () => {
  const doc = readFileSync(new URL('../../../docs/ledger-format.md', import.meta.url), 'utf8');
  const blocks = [...doc.matchAll(/```\n([\s\S]*?)```/g)].map((match) => match[1]);

  it('states the hash of each canonical text in its worked example', () => {
    const hashed = blocks.filter((block) => !block.startsWith('{"exportedAt"'));
    expect(hashed).toHaveLength(3);
    for (const block of hashed) {
      const text = block.trimEnd();
      // The hash is written after the block, before the next one.
      const after = doc.slice(doc.indexOf(block) + block.length);
      const stated = /hash = `([0-9a-f]{64})`/.exec(after)?.[1];
      expect(sha256HexOfText(text)).toBe(stated);
      expect(doc).toContain(`(${new TextEncoder().encode(text).length} bytes`);
    }
  });

  it('holds an example export that the verifier accepts', () => {
    const jsonl = blocks.find((block) => block.startsWith('{"exportedAt"'));
    expect(verifyAuditJsonl(jsonl ?? '')).toEqual({
      ok: true,
      eventsChecked: 2,
      sealsChecked: 1,
      lastSeal: { day: '2026-12-01', hash: 'ecf7a7d54b771a990106a3de541f10d348b9425fbf868a4c0982b869ae0ab6e0' },
    });
  });
});
