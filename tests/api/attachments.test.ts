import { createHash } from 'node:crypto';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { headFitsType } from '../../server/routes/attachments/upload';
import { objectKeyOf } from '../../server/storage/object-store';
import type { AttachmentUploadResult } from '../../shared/schemas/attachments';
import type { TraceView } from '../../shared/schemas/trace';
import { signedInAs, type SignedInAgent } from '../factories';
import { createTestContext, type TestContext } from '../support';
import { countRows } from '../ledger/ledger-fixtures';
import { buildLife, type Life } from './trace-fixtures';

let t: TestContext;
let tech: SignedInAgent;
let auditor: SignedInAgent;
let life: Life;

// The PNG signature (PNG specification, ISO/IEC 15948 §5.2) followed by filler: enough for the type check.
const PNG = Buffer.concat([Buffer.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]), Buffer.from('IHDR fracture face, invented')]);
const CSV = Buffer.from('extension_mm,force_N\n0.000,0\n0.010,1520\n0.020,3010\n');

function sha256(bytes: Buffer): string {
  return createHash('sha256').update(bytes).digest('hex');
}

function upload(agent: SignedInAgent, file: Buffer, name: string, fields: Record<string, string> = {}, contentType?: string) {
  let req = agent.post('/api/attachments');
  for (const [k, v] of Object.entries(fields)) req = req.field(k, v);
  return req.attach('file', file, contentType ? { filename: name, contentType } : name);
}

beforeAll(async () => {
  t = await createTestContext();
  tech = await signedInAs(t, 'technician');
  auditor = await signedInAs(t, 'auditor');
  life = await buildLife(t);
});
afterAll(async () => t?.close());

describe('POST /api/attachments', () => {
  it('stores a photo under its SHA-256 (computed on the way) and records an attached event carrying the hash', async () => {
    const res = await upload(tech, PNG, 'fracture-a.png', { itemCode: life.halfA, note: 'fracture face' }).expect(201);
    const body = res.body as AttachmentUploadResult;
    expect(body).toMatchObject({ sha256: sha256(PNG), size: PNG.length, type: 'image/png', category: 'photo', display: 'image', created: true });
    expect(body.event).toMatchObject({ item: life.halfA, seq: 4 });
    const [row] = (await t.sequelize.query('SELECT payload FROM custody_events WHERE hash = $1', { bind: [body.event?.hash] }))[0] as { payload: Record<string, unknown> }[];
    expect(row?.payload).toMatchObject({ sha256: sha256(PNG), name: 'fracture-a.png', category: 'photo', note: 'fracture face' });
    // Content-addressed: the object's key is derived from the hash, and its bytes are the upload's.
    const stored = await t.ctx.storage?.rehash(objectKeyOf(sha256(PNG)));
    expect(stored).toEqual({ sha256: sha256(PNG), size: PNG.length });
  });

  it('keeps the same content once: a second upload answers 200, created false, and adds no metadata row', async () => {
    const before = await countRows(t, 'attachments');
    const res = await upload(tech, PNG, 'same-bytes-other-name.png', { itemCode: life.halfB }).expect(200);
    expect(res.body).toMatchObject({ sha256: sha256(PNG), created: false, fileName: 'fracture-a.png' });
    expect(res.body.event).toMatchObject({ item: life.halfB });
    expect(await countRows(t, 'attachments')).toBe(before);
  });

  it('files a CSV as raw data by default, or as a conditioning log when asked', async () => {
    const raw = await upload(tech, CSV, 'record.csv', {}, 'text/csv').expect(201);
    expect(raw.body).toMatchObject({ category: 'raw_data', display: 'link', event: null });
    const log = Buffer.from('at,temperatureC,humidityPct\n2026-12-01T10:00:00Z,23.1,49\n');
    const res = await upload(tech, log, 'chamber.csv', { category: 'conditioning_log' }, 'text/csv').expect(201);
    expect(res.body.category).toBe('conditioning_log');
  });

  it('answers 415 for a type it does not keep, naming the accepted ones', async () => {
    const res = await upload(tech, Buffer.from('MZ not a program'), 'tool.exe', {}, 'application/x-msdownload').expect(415);
    expect(res.body.error.code).toBe('unsupported_type');
    expect(res.body.error.message).toMatch(/\.jpg.*\.mp4/);
  });

  it('answers 415 when the bytes are not what the name says', async () => {
    const res = await upload(tech, Buffer.from('this is text, not a jpeg image at all'), 'photo.jpg', {}, 'image/jpeg').expect(415);
    expect(res.body.error.code).toBe('content_mismatch');
  });

  it('answers 413 for a photo over its size limit, with the limit in the message', async () => {
    const big = Buffer.alloc(25 * 1024 * 1024 + 1, 0);
    Buffer.from([0xff, 0xd8, 0xff, 0xe0]).copy(big);
    const res = await upload(tech, big, 'huge.jpg', {}, 'image/jpeg').expect(413);
    expect(res.body.error).toMatchObject({ code: 'file_too_large', message: expect.stringContaining('25 MB') });
  });

  it('answers 422 when no file is sent, and for a category the type cannot fill', async () => {
    const none = await tech.post('/api/attachments').field('itemCode', life.halfA).expect(422);
    expect(none.body.error.code).toBe('no_file');
    const wrong = await upload(tech, PNG, 'x.png', { category: 'video' }).expect(422);
    expect(wrong.body.error.details).toEqual([expect.objectContaining({ path: 'category' })]);
  });

  it('refuses the auditor with 403: reading only', async () => {
    await upload(auditor, PNG, 'x.png').expect(403);
  });

  it('streams a large video through in chunks and serves byte ranges so it can seek', async () => {
    // An ISO base media file starts with a box whose type is "ftyp" (ISO/IEC 14496-12).
    const video = Buffer.alloc(12 * 1024 * 1024);
    for (let i = 0; i < video.length; i += 4) video.writeUInt32BE((i * 2654435761) >>> 0, i);
    Buffer.from([0, 0, 0, 0x18]).copy(video, 0);
    video.write('ftypisom', 4, 'latin1');
    const res = await upload(tech, video, 'pull.mp4', { itemCode: life.specimen }, 'video/mp4').expect(201);
    expect(res.body).toMatchObject({ sha256: sha256(video), size: video.length, display: 'video', category: 'video' });
    const whole = await auditor.get(`/api/attachments/${sha256(video)}`).buffer(true).parse(binary).expect(200);
    expect(whole.headers['accept-ranges']).toBe('bytes');
    expect(sha256(whole.body as Buffer)).toBe(sha256(video));
    const part = await auditor.get(`/api/attachments/${sha256(video)}`).set('Range', 'bytes=1000-1999').buffer(true).parse(binary).expect(206);
    expect(part.headers['content-range']).toBe(`bytes 1000-1999/${video.length}`);
    expect((part.body as Buffer).equals(video.subarray(1000, 2000))).toBe(true);
    await auditor.get(`/api/attachments/${sha256(video)}`).set('Range', `bytes=${video.length + 5}-`).expect(416);
  });
});

describe('GET /api/attachments/:sha256', () => {
  it('serves the stored bytes with their type, and 404 for an unknown hash', async () => {
    const res = await auditor.get(`/api/attachments/${sha256(PNG)}`).buffer(true).parse(binary).expect(200);
    expect(res.headers['content-type']).toBe('image/png');
    expect((res.body as Buffer).equals(PNG)).toBe(true);
    await auditor.get(`/api/attachments/${'0'.repeat(64)}`).expect(404);
    await auditor.get('/api/attachments/not-a-hash').expect(422);
    await request(t.app).get(`/api/attachments/${sha256(PNG)}`).expect(401);
  });
});

describe('GET /api/attachments/:sha256/check and the trace', () => {
  it('re-hashes stored objects, shows them on the item trace, and names a changed object', async () => {
    const ok = await auditor.get(`/api/attachments/${sha256(PNG)}/check`).expect(200);
    expect(ok.body).toMatchObject({ ok: true, problem: null });
    const trace = (await auditor.get(`/api/items/${life.halfA}/trace?files=rehash`).expect(200)).body as TraceView;
    // The half's own photo, and the video attached to the specimen it came from.
    expect(trace.attachments.map((a) => [a.item, a.category])).toEqual([[life.specimen, 'video'], [life.halfA, 'photo']]);
    expect(trace.attachments[1]).toMatchObject({ sha256: sha256(PNG), note: 'fracture face', href: `/api/attachments/${sha256(PNG)}` });
    expect(trace.files).toMatchObject({ mode: 'rehash', ok: true });
    // Overwrite the stored object behind the application's back.
    const tampered = Buffer.concat([PNG, Buffer.from('!')]);
    const tmp = `${process.env.HM_TEST_PG_DIR ?? '/tmp'}/tampered.png`;
    (await import('node:fs')).writeFileSync(tmp, tampered);
    await t.ctx.storage?.putFile(objectKeyOf(sha256(PNG)), tmp, tampered.length, 'image/png');
    const bad = await auditor.get(`/api/attachments/${sha256(PNG)}/check`).expect(200);
    expect(bad.body).toMatchObject({ ok: false, problem: 'changed', actual: sha256(tampered) });
    const after = (await auditor.get(`/api/items/${life.halfA}/trace?files=rehash`).expect(200)).body as TraceView;
    expect(after.files.ok).toBe(false);
    const presence = (await auditor.get(`/api/items/${life.halfA}/trace`).expect(200)).body as TraceView;
    expect(presence.files.checks.find((c) => c.sha256 === sha256(PNG))).toMatchObject({ ok: false, problem: 'size' });
  });
});

describe('headFitsType', () => {
  it('knows the signatures of the accepted types', () => {
    // JPEG SOI marker FF D8 then a marker (ITU-T T.81); WebP: RIFF form type WEBP (RIFF container); WebM: EBML 1A 45 DF A3.
    expect(headFitsType(Buffer.from([0xff, 0xd8, 0xff, 0xe1]), 'image/jpeg')).toBe(true);
    expect(headFitsType(Buffer.from('RIFF\x10\x00\x00\x00WEBPVP8 ', 'latin1'), 'image/webp')).toBe(true);
    expect(headFitsType(Buffer.from([0x1a, 0x45, 0xdf, 0xa3, 0x9f]), 'video/webm')).toBe(true);
    expect(headFitsType(Buffer.from('a,b\n1,2\n'), 'text/csv')).toBe(true);
    expect(headFitsType(Buffer.from([0x61, 0x00, 0x62]), 'text/plain')).toBe(false);
    expect(headFitsType(PNG, 'image/jpeg')).toBe(false);
  });
});

function binary(res: unknown, done: (err: Error | null, body: Buffer) => void): void {
  const stream = res as NodeJS.ReadableStream;
  const chunks: Buffer[] = [];
  stream.on('data', (c: Buffer) => chunks.push(c));
  stream.on('end', () => done(null, Buffer.concat(chunks)));
}
