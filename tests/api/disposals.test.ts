import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import type request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { QueryTypes } from 'sequelize';
import type { LedgerActor } from '../../server/ledger/types';
import { createTestContext, type TestContext } from '../support';
import { createUser, signIn, signedInAs, type SignedInAgent } from '../factories';
import { countRows } from '../ledger/ledger-fixtures';
import { DAY_MS, retainedOrder, sign, stateOf, type RetainedOrder } from './disposals-fixtures';

const run = promisify(execFile);

let t: TestContext;
let clerk: SignedInAgent;
let actor: LedgerActor;
/** Report issued 400 days ago, kept 30 days: due long since. */
let due: RetainedOrder;
/** Report issued yesterday, kept 30 days: not due for four weeks. */
let fresh: RetainedOrder;

beforeAll(async () => {
  t = await createTestContext();
  const user = await createUser(t, 'clerk');
  clerk = await signIn(t, user);
  actor = { kind: 'user', id: user.id, role: 'clerk' };
  due = await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - 400 * DAY_MS), specimens: 3 });
  fresh = await retainedOrder(t, actor, { reportIssuedAt: new Date(Date.now() - DAY_MS) });
});
afterAll(async () => t?.close());

function binary(test: request.Test): request.Test {
  return test.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });
}

async function pdfText(bytes: Buffer): Promise<string> {
  const dir = await mkdtemp(join(tmpdir(), 'hm-cert-'));
  try {
    await writeFile(join(dir, 'c.pdf'), bytes);
    const { stdout } = await run('/usr/bin/pdftotext', ['-layout', join(dir, 'c.pdf'), '-']);
    return stdout;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

async function disposedCount(): Promise<number> {
  return countRows(t, 'custody_events', `type IN ('disposed','returned')`);
}

describe('POST /api/disposals/check', () => {
  it('says for each scanned code whether it may go, and why not', async () => {
    const res = await clerk
      .post('/api/disposals/check', { codes: [due.halves[0], fresh.halves[0], due.halves[0], 'S26-00001-X', due.bag] })
      .expect(200);
    const lines = res.body.lines as { status: string; ok: boolean; message: string; heat?: string; order?: string }[];
    expect(res.body.ok).toBe(false);
    expect(lines.map((l) => l.status)).toEqual(['may_go', 'not_due', 'duplicate', 'invalid', 'invalid']);
    expect(lines[0]).toMatchObject({ ok: true, order: due.order, heat: due.heat });
    expect(lines[1]?.message).toMatch(/may not be disposed of before \d{4}-\d{2}-\d{2}/);
    expect(lines[2]?.message).toMatch(/already scanned into this batch/);
    expect(lines[4]?.message).toMatch(/container code/);
  });
});

describe('POST /api/disposals', () => {
  it('answers 422 signature_required for a batch with no signature, and disposes of nothing', async () => {
    const before = await disposedCount();
    const res = await clerk.post('/api/disposals', { codes: [due.halves[0]] }).expect(422);
    expect(res.body.error.code).toBe('signature_required');
    expect(res.body.error.details).toEqual([{ path: 'signatureToken', message: 'is required for a disposal' }]);
    expect(await disposedCount()).toBe(before);
  });

  it('refuses an item before its dispose-not-before date with 409, records nothing, and leaves the signature unspent', async () => {
    const token = await sign(clerk, 'disposal');
    const before = await disposedCount();
    const res = await clerk.post('/api/disposals', { codes: [due.halves[0], fresh.halves[0]], signatureToken: token }).expect(409);
    expect(res.body.error.code).toBe('batch_refused');
    const lines = res.body.error.details.lines as { code: string; status: string }[];
    expect(lines).toEqual([
      expect.objectContaining({ code: due.halves[0], status: 'may_go' }),
      expect.objectContaining({ code: fresh.halves[0], status: 'not_due' }),
    ]);
    expect(await disposedCount()).toBe(before);
    expect(await stateOf(t, due.halves[0] as string)).toBe('retained');
    const [row] = await t.owner.query<{ used_at: Date | null }>('SELECT used_at FROM signature_tokens ORDER BY id DESC LIMIT 1', { type: QueryTypes.SELECT });
    expect(row?.used_at).toBeNull();
  });

  it('refuses a held item: a hold on its heat blocks it until a signed release', async () => {
    const hold = await clerk.post('/api/holds', { scope: 'heat', ref: due.heat, reason: 'Customer dispute over the mill certificate' }).expect(201);
    const token = await sign(clerk, 'disposal');
    const res = await clerk.post('/api/disposals', { codes: [due.halves[1]], signatureToken: token }).expect(409);
    expect(res.body.error.details.lines[0]).toMatchObject({ status: 'held' });
    expect(res.body.error.details.lines[0].message).toMatch(/held by heat .*Customer dispute/);
    expect(await stateOf(t, due.halves[1] as string)).toBe('retained');

    // The release needs its own signature, with the meaning "hold-release".
    const unsigned = await clerk.post(`/api/holds/${hold.body.id}/release`, { reason: 'Dispute settled' }).expect(422);
    expect(unsigned.body.error.code).toBe('signature_required');
    const wrongMeaning = await clerk.post(`/api/holds/${hold.body.id}/release`, { reason: 'Dispute settled', signatureToken: token }).expect(422);
    expect(wrongMeaning.body.error.code).toBe('signature_meaning');
    const release = await sign(clerk, 'hold-release');
    const released = await clerk.post(`/api/holds/${hold.body.id}/release`, { reason: 'Dispute settled', signatureToken: release }).expect(200);
    expect(released.body).toMatchObject({ id: hold.body.id, releaseReason: 'Dispute settled', releasedBy: { id: clerk.user.id } });
    const again = await clerk.post(`/api/holds/${hold.body.id}/release`, { reason: 'again', signatureToken: await sign(clerk, 'hold-release') }).expect(409);
    expect(again.body.error.code).toBe('already_released');
  });

  it('refuses a hold on an order, and on one item’s specimen for its halves', async () => {
    const order = await clerk.post('/api/holds', { scope: 'order', ref: fresh.order, reason: 'Litigation hold' }).expect(201);
    expect(order.body).toMatchObject({ scope: 'order', ref: fresh.order, items: fresh.halves.length });
    const item = await clerk.post('/api/holds', { scope: 'item', ref: due.specimens[2], reason: 'Re-examination asked for' }).expect(201);
    const check = await clerk.post('/api/disposals/check', { codes: [fresh.halves[0], due.halves[4], due.halves[5]] }).expect(200);
    expect(check.body.lines.map((l: { status: string }) => l.status)).toEqual(['held', 'held', 'held']);
    const sig = await sign(clerk, 'hold-release');
    await clerk.post(`/api/holds/${item.body.id}/release`, { reason: 'Done', signatureToken: sig }).expect(200);
  });

  it('refuses another order’s item in a batch for one order', async () => {
    const token = await sign(clerk, 'disposal');
    const res = await clerk.post('/api/disposals', { codes: [due.halves[0], fresh.halves[1]], orderNumber: due.order, signatureToken: token }).expect(409);
    expect(res.body.error.details.lines[1]).toMatchObject({ status: 'other_order' });
    expect(res.body.error.details.lines[1].message).toContain(`belongs to order ${fresh.order}`);
  });

  it('refuses a code scanned twice in one batch with 409 and disposes of nothing', async () => {
    const token = await sign(clerk, 'disposal');
    const before = await disposedCount();
    const res = await clerk.post('/api/disposals', { codes: [due.halves[0], due.halves[0]], signatureToken: token }).expect(409);
    expect(res.body.error.details.lines[1]).toMatchObject({ status: 'duplicate' });
    expect(await disposedCount()).toBe(before);
  });

  it('refuses a signature given for another meaning', async () => {
    const token = await sign(clerk, 'void');
    const res = await clerk.post('/api/disposals', { codes: [due.halves[0]], signatureToken: token }).expect(422);
    expect(res.body.error.code).toBe('signature_meaning');
  });

  let certificateNumber = '';
  let disposed: string[] = [];

  it('disposes of every item of a valid batch with one signed event each, and keeps the certificate', async () => {
    disposed = [due.halves[0], due.halves[1], due.halves[2]] as string[];
    const token = await sign(clerk, 'disposal');
    const before = await disposedCount();
    const res = await clerk.post('/api/disposals', { codes: disposed, orderNumber: due.order, signatureToken: token }).expect(201);
    certificateNumber = res.body.number;
    expect(res.body).toMatchObject({ kind: 'disposal', order: due.order, meaning: 'disposal', signer: { id: clerk.user.id } });
    expect(res.body.number).toMatch(/^D-\d{4}-\d{5}$/);
    expect(res.body.items.map((i: { code: string }) => i.code)).toEqual(disposed);
    expect(await disposedCount()).toBe(before + 3);
    for (const code of disposed) expect(await stateOf(t, code)).toBe('disposed');
    // Each event carries the batch in its payload and the signature (signer, meaning, time) in the
    // event's own hashed signature member.
    const events = await t.owner.query<{ item_code: string; signature: { signer: number; meaning: string; signedAt: string }; hash: string }>(
      `SELECT item_code, signature, hash FROM custody_events WHERE type = 'disposed' AND payload->>'batch' = $1 ORDER BY id`,
      { bind: [certificateNumber], type: QueryTypes.SELECT },
    );
    expect(events.map((e) => e.item_code)).toEqual(disposed);
    for (const e of events) expect(e.signature).toMatchObject({ signer: clerk.user.id, meaning: 'disposal' });
    expect(res.body.items.map((i: { eventHash: string }) => i.eventHash)).toEqual(events.map((e) => e.hash));
    // The ledger still verifies after the batch.
    const verify = await clerk.get('/api/ledger/verify').expect(200);
    expect(verify.body.ok).toBe(true);
  });

  it('refuses the same signature token a second time (single use), and disposes of nothing', async () => {
    const token = await sign(clerk, 'disposal');
    await clerk.post('/api/disposals', { codes: [due.halves[3]], signatureToken: token }).expect(201);
    const before = await disposedCount();
    const res = await clerk.post('/api/disposals', { codes: [due.halves[4]], signatureToken: token }).expect(422);
    expect(res.body.error.code).toBe('signature_used');
    expect(await stateOf(t, due.halves[4] as string)).toBe('retained');
    expect(await disposedCount()).toBe(before);
  });

  it('refuses an item already disposed of as not retained', async () => {
    const res = await clerk.post('/api/disposals/check', { codes: [disposed[0]] }).expect(200);
    expect(res.body.lines[0]).toMatchObject({ status: 'not_retained' });
    expect(res.body.lines[0].message).toMatch(/is disposed; only retained items may be disposed of/);
  });

  it('lists exactly the disposed items, each with its heat and order, the signer, time and meaning, in the certificate PDF', async () => {
    const res = await binary(clerk.get(`/api/disposals/${certificateNumber}/document.pdf`)).expect(200);
    expect(res.headers['content-type']).toMatch(/application\/pdf/);
    const text = await pdfText(res.body as Buffer);
    expect(text).toContain('Disposal certificate');
    expect(text).toContain(certificateNumber);
    // Exactly the disposed halves: every half code on the page, and no other.
    const listed = [...text.matchAll(/S\d{2}-\d{5,9}[AB]-[0-9A-Z*]/g)].map((m) => m[0]);
    expect(new Set(listed)).toEqual(new Set(disposed));
    expect(listed).toHaveLength(disposed.length);
    expect(text).toContain(due.heat);
    expect(text).toContain(due.order);
    expect(text).toContain(clerk.user.name);
    expect(text).toMatch(/Meaning of the signature\s+disposal/);
    expect(text).toContain('I confirm that the listed items may be disposed of');
    expect(text).toMatch(/Signed at\s+\d{4}-\d{2}-\d{2} \d{2}:\d{2}:\d{2} UTC/);
    expect(text).toMatch(/End of list: 3 items\./);
    const fonts = await (async () => {
      const dir = await mkdtemp(join(tmpdir(), 'hm-cert-'));
      try {
        await writeFile(join(dir, 'c.pdf'), res.body as Buffer);
        return (await run('/usr/bin/pdffonts', [join(dir, 'c.pdf')])).stdout;
      } finally {
        await rm(dir, { recursive: true, force: true });
      }
    })();
    // Fonts are embedded (pdffonts "emb" column), so the certificate prints the same anywhere.
    for (const row of fonts.split('\n').slice(2).filter(Boolean)) expect(row).toMatch(/\syes\s+(yes|no)\s+(yes|no)\s+\d+\s+\d+\s*$/);
  });

  it('shows the batch with its items, and lists batches', async () => {
    const one = await clerk.get(`/api/disposals/${certificateNumber}`).expect(200);
    expect(one.body.items).toHaveLength(3);
    const list = await clerk.get('/api/disposals?kind=disposal').expect(200);
    expect(list.body.items.map((b: { number: string }) => b.number)).toContain(certificateNumber);
    expect(list.body.items.find((b: { number: string }) => b.number === certificateNumber).itemCount).toBe(3);
  });

  it('refuses a technician (403): disposal is the clerk’s or the manager’s', async () => {
    const tech = await signedInAs(t, 'technician');
    const res = await tech.post('/api/disposals', { codes: [due.halves[4]], signatureToken: 'x' }).expect(403);
    expect(res.body.error.code).toBe('forbidden');
  });
});

describe('POST /api/disposals (kind return)', () => {
  it('returns items to the customer before their date with a transfer form, and refuses another customer’s item', async () => {
    const other = await retainedOrder(t, actor, { reportIssuedAt: null, specimens: 1 });
    const token = await sign(clerk, 'return');
    const mixed = await clerk.post('/api/disposals', { kind: 'return', codes: [other.halves[0], due.halves[5]], signatureToken: token }).expect(409);
    expect(mixed.body.error.details.lines[1]).toMatchObject({ status: 'other_customer' });
    const wrong = await clerk.post('/api/disposals', { kind: 'return', codes: other.halves, signatureToken: await sign(clerk, 'disposal') }).expect(422);
    expect(wrong.body.error.code).toBe('signature_meaning');
    const res = await clerk.post('/api/disposals', { kind: 'return', codes: other.halves, signatureToken: token, recipient: 'A. Invented, goods-in' }).expect(201);
    expect(res.body).toMatchObject({ kind: 'return', meaning: 'return', recipient: 'A. Invented, goods-in' });
    expect(res.body.number).toMatch(/^R-/);
    for (const code of other.halves) expect(await stateOf(t, code)).toBe('returned');
    const pdf = await binary(clerk.get(res.body.documentUrl)).expect(200);
    const text = await pdfText(pdf.body as Buffer);
    expect(text).toContain('Transfer form');
    expect(text).toContain('A. Invented, goods-in');
    for (const code of other.halves) expect(text).toContain(code);
    expect(text).toMatch(/Meaning of the signature\s+return/);
  });
});
