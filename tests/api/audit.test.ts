import { execFile } from 'node:child_process';
import { mkdtempSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { promisify } from 'node:util';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { sealDay } from '../../server/commands/seal-day';
import { verifyAuditJsonl } from '../../shared/domain/ledger/audit-jsonl';
import { canonicalJson } from '../../shared/domain/ledger/canonical';
import { createInstrumentToken, signedInAs, type SignedInAgent } from '../factories';
import type { TestContext } from '../support';
import { startTraceRig, type Life } from './trace-fixtures';
// The standalone verifier is plain JavaScript with no dependencies; the tests import its parts too.
import { canonicalize, verifyPack } from '../../tools/verify-audit-pack.mjs';

const run = promisify(execFile);
const VERIFIER = path.resolve('tools/verify-audit-pack.mjs');

let t: TestContext;
let auditor: SignedInAgent;
let life: Life;
let dir: string;

beforeAll(async () => {
  ({ t, auditor, life } = await startTraceRig());
  // Seal today as if the day were over, so the pack carries a seal over these chains.
  const today = new Date().toISOString().slice(0, 10);
  const sealed = await sealDay(t.sequelize, today, new Date(Date.now() + 2 * 86_400_000));
  expect(sealed.sealed).toBe(true);
  dir = mkdtempSync(path.join(process.env.HM_TEST_PG_DIR ?? os.tmpdir(), 'pack-'));
});
afterAll(async () => t?.close());

/** Runs the standalone verifier on a file with plain node, outside the test runner's module system. */
async function verifyFile(file: string, json = false): Promise<{ code: number; out: string }> {
  try {
    const { stdout } = await run(process.execPath, [VERIFIER, ...(json ? ['--json'] : []), file], { cwd: dir, env: {} });
    return { code: 0, out: stdout };
  } catch (error) {
    const e = error as { code: number; stdout: string };
    return { code: e.code, out: e.stdout };
  }
}

async function exportPack(code: string): Promise<string> {
  const res = await auditor.get(`/api/items/${code}/audit.jsonl`).buffer(true).parse((r, done) => {
    let text = '';
    r.setEncoding('utf8');
    r.on('data', (c: string) => (text += c));
    r.on('end', () => done(null, text));
  });
  expect(res.status).toBe(200);
  expect(res.headers['content-type']).toMatch(/application\/x-ndjson/);
  return res.body as string;
}

describe('GET /api/items/:code/audit.jsonl and tools/verify-audit-pack.mjs', () => {
  it('exports every event of a specimen and its halves with the seal, and the standalone verifier passes it', async () => {
    const text = await exportPack(life.specimen);
    const lines = text.trimEnd().split('\n').map((l) => JSON.parse(l) as { record: string; body: { item: string }; items?: string[] });
    expect(lines[0]).toMatchObject({ record: 'header', items: [life.specimen, life.halfA, life.halfB] });
    // registered, cut, measured, tested + split_from, binned, retained for A + split_from, binned for B.
    expect(lines.filter((l) => l.record === 'event')).toHaveLength(9);
    expect(lines.filter((l) => l.record === 'seal')).toHaveLength(1);
    expect(verifyAuditJsonl(text)).toMatchObject({ ok: true, eventsChecked: 9, sealsChecked: 1 });

    const file = path.join(dir, 'pack.jsonl');
    writeFileSync(file, text);
    const { code, out } = await verifyFile(file);
    expect(code).toBe(0);
    expect(out).toMatch(/^INTACT: 9 events and 1 seals verify/);
  });

  it('names the break when one byte of an event is changed', async () => {
    const text = await exportPack(life.halfA);
    const lines = text.split('\n');
    const index = lines.findIndex((l) => l.includes('"type":"retained"'));
    const line = lines[index]!;
    // One byte: a digit of the device time of half A's retained event.
    const at = line.indexOf('"occurredAt":"') + '"occurredAt":"'.length + 3;
    const changed = line.slice(0, at) + (line[at] === '6' ? '7' : '6') + line.slice(at + 1);
    expect(changed.length).toBe(line.length);
    lines[index] = changed;
    const file = path.join(dir, 'tampered.jsonl');
    writeFileSync(file, lines.join('\n'));
    const { code, out } = await verifyFile(file);
    expect(code).toBe(1);
    expect(out).toContain(`BROKEN at line ${index + 1} (${life.halfA} seq 3): hash-mismatch`);
    const json = JSON.parse((await verifyFile(file, true)).out) as ReturnType<typeof verifyPack>;
    expect(json).toMatchObject({ ok: false, firstBreak: { line: index + 1, reason: 'hash-mismatch', item: life.halfA, seq: 3 } });
    // The app's own reference check agrees on where it broke.
    expect(verifyAuditJsonl(lines.join('\n'))).toMatchObject({ ok: false, firstBreak: { line: index + 1, reason: 'hash-mismatch' } });
  });

  it('names a deleted event (seq gap) and a rewritten seal', async () => {
    const lines = (await exportPack(life.specimen)).split('\n');
    const cut = lines.findIndex((l) => l.includes('"type":"cut"'));
    const withoutCut = lines.filter((_, i) => i !== cut).join('\n');
    expect(verifyPack(withoutCut)).toMatchObject({ ok: false, firstBreak: { reason: 'seq-gap', item: life.specimen, expected: 2, actual: 3 } });
    const sealIndex = lines.findIndex((l) => l.includes('"record":"seal"'));
    const badSeal = lines.map((l, i) => (i === sealIndex ? l.replace(/"seq":(\d+)/, (_m, n: string) => `"seq":${Number(n) + 1}`) : l)).join('\n');
    expect(verifyPack(badSeal)).toMatchObject({ ok: false, firstBreak: { record: 'seal', reason: 'seal-hash-mismatch' } });
  });

  it('answers any role that may verify (a technician too), and 401 without a session', async () => {
    const tech = await signedInAs(t, 'technician');
    await tech.get(`/api/items/${life.halfA}/audit.jsonl`).expect(200);
    await request(t.app).get(`/api/items/${life.halfA}/audit.jsonl`).expect(401);
    await request(t.app).get(`/api/items/${life.halfA}/audit.pdf`).expect(401);
  });
});

describe('GET /api/items/:code/audit.pdf', () => {
  it('answers a PDF with the fonts embedded, the genealogy, the date of verification and page x of y', async () => {
    const res = await auditor.get(`/api/items/${life.halfA}/audit.pdf`).buffer(true).parse((r, done) => {
      const chunks: Buffer[] = [];
      r.on('data', (c: Buffer) => chunks.push(c));
      r.on('end', () => done(null, Buffer.concat(chunks)));
    });
    expect(res.status).toBe(200);
    expect(res.headers['content-type']).toBe('application/pdf');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    const { PDFDocument, PDFName, PDFDict } = await import('pdf-lib');
    const doc = await PDFDocument.load(pdf);
    expect(doc.getPageCount()).toBeGreaterThanOrEqual(2);
    // Every font the pages use is embedded (a FontFile2/3 stream under its descriptor).
    const fonts = doc.context.enumerateIndirectObjects().filter(([, obj]) => obj instanceof PDFDict && obj.get(PDFName.of('Type')) === PDFName.of('FontDescriptor'));
    expect(fonts.length).toBeGreaterThanOrEqual(2);
    for (const [, descriptor] of fonts) {
      const d = descriptor as import('pdf-lib').PDFDict;
      expect(d.get(PDFName.of('FontFile2')) ?? d.get(PDFName.of('FontFile3')) ?? d.get(PDFName.of('FontFile'))).toBeDefined();
    }
    // The text, read back with poppler's pdftotext (installed for the test run).
    const file = path.join(dir, 'pack.pdf');
    writeFileSync(file, pdf);
    const { stdout } = await run('pdftotext', ['-layout', file, '-']);
    expect(stdout).toContain(life.halfA);
    expect(stdout).toContain(life.orderNumber);
    expect(stdout).toContain(life.heatNumber);
    expect(stdout).toContain('Date of verification');
    expect(stdout).toMatch(/Chains intact: 2 of 2/);
    expect(stdout).toMatch(new RegExp(`page 1 of ${doc.getPageCount()}`));
    expect(stdout).toMatch(/maxForceN: 11250/);
  });

  it('answers 403 to an instrument token: instruments post events and read items, they do not export packs', async () => {
    const { token } = await createInstrumentToken(t, { eventTypes: ['tested'] });
    const res = await request(t.app).get(`/api/items/${life.halfA}/audit.pdf`).set('Authorization', `Bearer ${token}`).expect(403);
    expect(res.body.error.code).toBe('forbidden');
    await request(t.app).get(`/api/items/${life.halfA}/trace`).set('Authorization', `Bearer ${token}`).expect(200);
  });
});

describe('the standalone canonicalizer (RFC 8785)', () => {
  it('writes the RFC 8785 §3.2.2 sample exactly (118 bytes)', () => {
    // RFC 8785 §3.2.2/3.2.4 sample input and output (CHECKS.md, [copy][run]).
    const input =
      '{"numbers":[333333333.33333329,1E30,4.50,2e-3,0.000000000000000000000000001],"string":"\\u20ac$\\u000F\\u000aA\'\\u0042\\u0022\\u005c\\\\\\"\\/","literals":[null,true,false]}';
    const expected = '{"literals":[null,true,false],"numbers":[333333333.3333333,1e+30,4.5,0.002,1e-27],"string":"€$\\u000f\\nA\'B\\"\\\\\\\\\\"/"}';
    const out = canonicalize(JSON.parse(input));
    expect(out).toBe(expected);
    expect(Buffer.byteLength(out, 'utf8')).toBe(118);
  });

  it('sorts member names by UTF-16 code units (RFC 8785 §3.2.3)', () => {
    // §3.2.3 order: \r, 1, U+0080, ö, €, U+1F600, U+FB33 (CHECKS.md, [copy][run]).
    const keys = ['\u20ac', '\r', '\ufb33', '1', '\u{1f600}', '\u0080', '\u00f6'];
    const out = canonicalize(Object.fromEntries(keys.map((k, i) => [k, i])));
    const order = Object.keys(JSON.parse(out) as object);
    // Compare the text, not a parsed object's key order (JS moves integer-like keys first).
    expect(out.indexOf('"\\r"')).toBeLessThan(out.indexOf('"1"'));
    expect(order.filter((k) => k !== '1')).toEqual(['\r', '\u0080', '\u00f6', '\u20ac', '\u{1f600}', '\ufb33']);
  });

  it('writes the RFC 8785 Appendix B numbers and refuses NaN and Infinity', () => {
    // IEEE-754 bit patterns → text (RFC 8785 Appendix B, CHECKS.md [copy][run]).
    const fromHex = (hex: string) => Buffer.from(hex, 'hex').readDoubleBE(0);
    expect(canonicalize(fromHex('0000000000000001'))).toBe('5e-324');
    expect(canonicalize(fromHex('4340000000000000'))).toBe('9007199254740992');
    expect(canonicalize(fromHex('44b52d02c7e14af6'))).toBe('1e+23');
    expect(canonicalize(fromHex('3eb0c6f7a0b5ed8c'))).toBe('9.999999999999997e-7');
    expect(canonicalize(fromHex('3eb0c6f7a0b5ed8d'))).toBe('0.000001');
    expect(canonicalize(fromHex('8000000000000000'))).toBe('0');
    expect(() => canonicalize(Number.NaN)).toThrow();
    expect(() => canonicalize(Number.POSITIVE_INFINITY)).toThrow();
  });

  it('agrees with the app canonicaliser on ledger-shaped values', () => {
    const value = { payload: { width: ['12.50', '12.52'], area: { mm2: '24.9148', sections: [1, 2.5, -0.001] }, 'ö': null }, seq: 3, signature: null };
    expect(canonicalize(value)).toBe(canonicalJson(value));
  });
});
