import { QueryTypes } from 'sequelize';
import type request from 'supertest';
import { PDFDocument } from 'pdf-lib';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { crop, decodeWithZxingJs, decodeWithZxingWasm, rasterise } from '../../labels/decode-for-tests';
import { planLabel, SYMBOLOGY_BY_KIND } from '../../labels/layouts';
import { labelRects } from '../../labels/render';
import { findStock } from '../../labels/stocks';
import { encodeSymbol } from '../../labels/symbols';
import { badgeCode } from '../../shared/domain/codes';
import { createTestContext, type TestContext } from '../support';
import { createUser, signIn, signedInAs, type SignedInAgent } from '../factories';
import { countRows, createContainer, createSample, createSpecimen, FLAT_READINGS, managerActor, scan } from '../ledger/ledger-fixtures';
import type { LedgerActor } from '../../server/ledger/types';

let t: TestContext;
let tech: SignedInAgent;
let manager: SignedInAgent;
let auditor: SignedInAgent;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  t = await createTestContext();
  tech = await signedInAs(t, 'technician');
  manager = await signedInAs(t, 'manager');
  auditor = await signedInAs(t, 'auditor');
  actor = await managerActor(t);
  ({ sampleId } = await createSample(t));
});
afterAll(async () => t?.close());

/** Reads a binary answer (the PDF) into a Buffer; supertest only buffers text types itself. */
function binary(test: request.Test): request.Test {
  return test.buffer(true).parse((res, done) => {
    const chunks: Buffer[] = [];
    res.on('data', (c: Buffer) => chunks.push(c));
    res.on('end', () => done(null, Buffer.concat(chunks)));
  });
}

async function print(agent: SignedInAgent, body: Record<string, unknown>): Promise<request.Response> {
  return binary(agent.post('/api/labels', body));
}

interface PrintEvent {
  item_code: string;
  actor_user_id: number;
  payload: { kind: string; stock: string; reprint: boolean; reason?: string; copies?: number };
}

async function printEvents(codes: readonly string[]): Promise<PrintEvent[]> {
  return t.owner.query<PrintEvent>(
    `SELECT item_code, actor_user_id, payload FROM custody_events WHERE type = 'label_printed' AND item_code = ANY($1::text[]) ORDER BY id`,
    { bind: [codes], type: QueryTypes.SELECT },
  );
}

const labelEvents = () => countRows(t, 'custody_events', `type = 'label_printed'`);

/** A specimen taken through cut, measured and a fractured test: returns its code and its halves. */
async function brokenSpecimen(): Promise<{ specimen: string; halfA: string; halfB: string }> {
  const specimen = await createSpecimen(t, actor, sampleId);
  await tech.post('/api/events', scan('cut', specimen)).expect(201);
  await tech.post('/api/events', scan('measured', specimen, { payload: FLAT_READINGS })).expect(201);
  const res = await tech.post('/api/events', scan('tested', specimen, { payload: { fractured: true } })).expect(201);
  const [halfA, halfB] = res.body.halves as string[];
  return { specimen, halfA: halfA as string, halfB: halfB as string };
}

/** Flips the check character of a valid code to another one, which MOD 37-2 always catches. */
function wrongCheck(code: string): string {
  return code.slice(0, -1) + (code.endsWith('0') ? '1' : '0');
}

describe('GET /api/labels/stocks', () => {
  it('lists the stocks with their grids for someone who prints labels', async () => {
    const res = await tech.get('/api/labels/stocks').expect(200);
    const keys = (res.body.stocks as { key: string }[]).map((s) => s.key);
    expect(keys).toEqual(expect.arrayContaining(['roll-51x25', 'a4-3x8', 'letter-3x10']));
    expect(res.body.stocks.find((s: { key: string }) => s.key === 'a4-3x8')).toMatchObject({ kind: 'sheet', columns: 3, rows: 8, positionsPerPage: 24 });
    expect(res.body.maxLabels).toBe(2000);
  });

  it('answers 403 for a role that prints no labels', async () => {
    await auditor.get('/api/labels/stocks').expect(403);
  });
});

describe('POST /api/labels', () => {
  it('prints specimen labels as a PDF and records one label_printed event per specimen', async () => {
    const codes = [await createSpecimen(t, actor, sampleId), await createSpecimen(t, actor, sampleId)];
    const res = await print(tech, { kind: 'specimen', codes, stock: 'a4-3x8', startPosition: 5 }).then((r) => {
      expect(r.status).toBe(200);
      return r;
    });
    expect(res.headers['content-type']).toBe('application/pdf');
    expect(res.headers['x-halfmark-labels']).toBe('2');
    expect(res.headers['x-halfmark-events']).toBe('2');
    const pdf = res.body as Buffer;
    expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
    expect((await PDFDocument.load(pdf)).getPageCount()).toBe(1);
    const events = await printEvents(codes);
    expect(events.map((e) => e.item_code)).toEqual(codes);
    for (const e of events) {
      expect(e.actor_user_id).toBe(tech.user.id);
      expect(e.payload).toEqual({ kind: 'specimen', stock: 'a4-3x8', reprint: false });
    }
  });

  it('prints a half-B label right after the test that broke the specimen', async () => {
    const { halfB } = await brokenSpecimen();
    const res = await print(tech, { kind: 'half', codes: [halfB], stock: 'roll-51x25' });
    expect(res.status).toBe(200);
    expect(await printEvents([halfB])).toMatchObject([{ item_code: halfB, payload: { kind: 'half', stock: 'roll-51x25', reprint: false } }]);
  });

  it('prints container and bag labels for containers, each an event on the container', async () => {
    const box = await createContainer(t, actor, 'box');
    const bag = await createContainer(t, actor, 'bag');
    expect((await print(tech, { kind: 'container', codes: [box], stock: 'roll-102x51' })).status).toBe(200);
    expect((await print(tech, { kind: 'bag', codes: [bag], stock: 'letter-3x10' })).status).toBe(200);
    expect(await printEvents([box, bag])).toMatchObject([
      { item_code: box, payload: { kind: 'container', stock: 'roll-102x51', reprint: false } },
      { item_code: bag, payload: { kind: 'bag', stock: 'letter-3x10', reprint: false } },
    ]);
  });

  it('prints badge cards for a manager and records nothing in the ledger: people are not ledger items', async () => {
    const person = await createUser(t, 'machinist', { name: 'Invented Machinist' });
    const code = badgeCode();
    await t.sequelize.query('UPDATE users SET badge_code = $1 WHERE id = $2', { bind: [code, person.id] });
    const before = await countRows(t, 'custody_events');
    const res = await print(manager, { kind: 'badge', codes: [code], stock: 'roll-57x32' });
    expect(res.status).toBe(200);
    expect(res.headers['x-halfmark-events']).toBe('0');
    expect(await countRows(t, 'custody_events')).toBe(before);
  });

  it('answers 403 when someone who does not manage people asks for badge cards', async () => {
    const res = await tech.post('/api/labels', { kind: 'badge', codes: [badgeCode()], stock: 'roll-57x32' }).expect(403);
    expect(res.body.error.code).toBe('forbidden');
  });

  it('answers 403 for a role that prints no labels', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    await auditor.post('/api/labels', { kind: 'specimen', codes: [code], stock: 'a4-3x8' }).expect(403);
    expect(await printEvents([code])).toEqual([]);
  });

  it('refuses a reprint without a reason with 422 beside the reason field, and records the reprint with its reason', async () => {
    const printed = await createSpecimen(t, actor, sampleId);
    const fresh = await createSpecimen(t, actor, sampleId);
    expect((await print(tech, { kind: 'specimen', codes: [printed], stock: 'a4-3x8' })).status).toBe(200);

    const before = await labelEvents();
    const refused = await tech.post('/api/labels', { kind: 'specimen', codes: [fresh, printed], stock: 'a4-3x8' }).expect(422);
    expect(refused.body.error.code).toBe('reprint_reason_required');
    expect(refused.body.error.message).toContain(printed);
    expect(refused.body.error.details).toEqual(
      expect.arrayContaining([
        expect.objectContaining({ path: 'reprint.reason' }),
        expect.objectContaining({ path: 'codes.1', message: expect.stringContaining(printed) }),
      ]),
    );
    expect(await labelEvents()).toBe(before);

    const empty = await tech.post('/api/labels', { kind: 'specimen', codes: [printed], stock: 'a4-3x8', reprint: { reason: '  ' } }).expect(422);
    expect(empty.body.error.details[0].path).toBe('reprint.reason');

    const res = await print(tech, { kind: 'specimen', codes: [fresh, printed], stock: 'a4-3x8', reprint: { reason: 'Label smudged by cutting fluid' } });
    expect(res.status).toBe(200);
    expect(res.headers['x-halfmark-reprinted']).toBe(printed);
    const events = await printEvents([printed, fresh]);
    expect(events.map((e) => [e.item_code, e.payload])).toEqual([
      [printed, { kind: 'specimen', stock: 'a4-3x8', reprint: false }],
      [fresh, { kind: 'specimen', stock: 'a4-3x8', reprint: false }],
      [printed, { kind: 'specimen', stock: 'a4-3x8', reprint: true, reason: 'Label smudged by cutting fluid' }],
    ]);
  });

  it('prints two copies of one code as two labels and one event that says so', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const res = await print(tech, { kind: 'specimen', codes: [code, code], stock: 'a4-3x8' });
    expect(res.status).toBe(200);
    expect(res.headers['x-halfmark-labels']).toBe('2');
    expect((await printEvents([code])).map((e) => e.payload)).toEqual([{ kind: 'specimen', stock: 'a4-3x8', reprint: false, copies: 2 }]);
  });

  it('answers 422 naming a code whose check character is wrong, and records nothing', async () => {
    const good = await createSpecimen(t, actor, sampleId);
    const bad = wrongCheck(await createSpecimen(t, actor, sampleId));
    const before = await labelEvents();
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: [good, bad], stock: 'a4-3x8' }).expect(422);
    expect(res.body.error.code).toBe('check_character');
    expect(res.body.error.message).toContain(bad);
    expect(res.body.error.details).toEqual([{ path: 'codes.1', message: expect.stringContaining('check character') }]);
    expect(await labelEvents()).toBe(before);
  });

  it('answers 404 naming an unknown code, and prints nothing for the known ones', async () => {
    const good = await createSpecimen(t, actor, sampleId);
    // S26-99999-? : a well-formed code with a correct check character that no specimen carries.
    const { specimenCode } = await import('../../shared/domain/codes');
    const unknown = specimenCode(26, 99_999_999);
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: [good, unknown], stock: 'a4-3x8' }).expect(404);
    expect(res.body.error.code).toBe('not_found');
    expect(res.body.error.message).toContain(unknown);
    expect(res.body.error.details).toEqual([{ path: 'codes.1', message: expect.stringContaining(unknown) }]);
    expect(await printEvents([good])).toEqual([]);
  });

  it('answers 422 for a code of the wrong kind for the label', async () => {
    const box = await createContainer(t, actor, 'box');
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: [box], stock: 'a4-3x8' }).expect(422);
    expect(res.body.error.code).toBe('wrong_kind');
    expect(res.body.error.message).toContain(box);
    expect(await printEvents([box])).toEqual([]);
  });

  it('answers 422 for an unknown stock, listing the stocks there are', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: [code], stock: 'a5-2x3' }).expect(422);
    expect(res.body.error.code).toBe('unknown_stock');
    expect(res.body.error.message).toContain('a5-2x3');
    for (const key of ['roll-51x25', 'roll-57x32', 'roll-102x51', 'a4-3x8', 'letter-3x10']) expect(res.body.error.message).toContain(key);
    expect(await printEvents([code])).toEqual([]);
  });

  it('answers 422 for a start position off the sheet, beside the field', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: [code], stock: 'a4-3x8', startPosition: 25 }).expect(422);
    expect(res.body.error.code).toBe('bad_start_position');
    expect(res.body.error.details[0].path).toBe('startPosition');
    expect(await printEvents([code])).toEqual([]);
  });

  it('refuses 10,000 codes in one request with 413 and a clear limit, and records nothing', async () => {
    const code = await createSpecimen(t, actor, sampleId);
    const before = await countRows(t, 'custody_events');
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: Array(10_000).fill(code), stock: 'a4-3x8' }).expect(413);
    expect(res.body.error.code).toBe('too_many_labels');
    expect(res.body.error.message).toContain('10,000');
    expect(res.body.error.message).toContain('2,000');
    expect(res.body.error.details).toEqual({ max: 2000, received: 10_000 });
    expect(await countRows(t, 'custody_events')).toBe(before);
  });

  it('answers 409 for an item whose state takes no label, and records nothing for the others', async () => {
    const away = await createSpecimen(t, actor, sampleId);
    const here = await createSpecimen(t, actor, sampleId);
    await tech.post('/api/events', scan('sent', away)).expect(201);
    const res = await tech.post('/api/labels', { kind: 'specimen', codes: [here, away], stock: 'a4-3x8' }).expect(409);
    expect(res.body.error.code).toBe('state_refused');
    expect(res.body.error.message).toContain(away);
    expect(await printEvents([here, away])).toEqual([]);
  });

  it('answers 422 with field errors for a body that does not fit the schema', async () => {
    const res = await tech.post('/api/labels', { kind: 'sticker', codes: [], stock: '' }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['kind', 'codes', 'stock']));
  });

  it('answers 401 without a session', async () => {
    const { default: supertest } = await import('supertest');
    await supertest(t.app).post('/api/labels').send({ kind: 'specimen', codes: ['S26-00001-X'], stock: 'a4-3x8' }).expect(401);
  });

  it('returns a PDF whose symbols scan back to the codes with two independent decoders', async () => {
    // Rasterised at 300 dpi by poppler's pdftoppm, decoded by @zxing/library and zxing-wasm, which
    // share no code with the encoder (bwip-js).
    const { halfB } = await brokenSpecimen();
    const specimen = await createSpecimen(t, actor, sampleId);
    const cases = [
      { kind: 'specimen', code: specimen, stockKey: 'letter-3x10', startPosition: 7 },
      { kind: 'half', code: halfB, stockKey: 'roll-51x25', startPosition: 1 },
    ] as const;
    for (const { kind, code, stockKey, startPosition } of cases) {
      const res = await print(tech, { kind, codes: [code], stock: stockKey, startPosition });
      expect(res.status).toBe(200);
      const stock = findStock(stockKey);
      if (stock === undefined) throw new Error(`no stock ${stockKey}`);
      const [rect] = labelRects(stockKey, 1, startPosition);
      const [page] = await rasterise(new Uint8Array(res.body as Buffer), 1);
      if (rect === undefined || page === undefined) throw new Error('nothing rendered');
      const symbology = SYMBOLOGY_BY_KIND[kind];
      const qz = planLabel(kind, stock, encodeSymbol(symbology, code)).symbol.withQuietZone;
      const cut = crop(page, { x: rect.xMm + qz.x, y: rect.yMm + qz.y, width: qz.width, height: qz.height }, 12);
      expect(decodeWithZxingJs(cut, symbology), `@zxing/library, ${kind}`).toBe(code);
      expect(await decodeWithZxingWasm(cut, symbology), `zxing-wasm, ${kind}`).toEqual([code]);
    }
  });
});

describe('POST /api/labels by a retained-sample clerk', () => {
  it('prints a bin label and names the clerk as the event\'s actor', async () => {
    const clerk = await createUser(t, 'clerk');
    const agent = await signIn(t, clerk);
    const bin = await createContainer(t, actor, 'bin', { binHalf: 'B' });
    expect((await print(agent, { kind: 'container', codes: [bin], stock: 'a4-3x8' })).status).toBe(200);
    expect(await printEvents([bin])).toMatchObject([{ actor_user_id: clerk.id }]);
  });
});
