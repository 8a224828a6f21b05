import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { CUT_LIST_MAX_BYTES } from '../../shared/schemas/cut-list';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let machinist: SignedInAgent;
let customerId: number;
let seq = 0;

async function orderWithHeats(heatNumbers: string[], over: Record<string, unknown> = {}): Promise<{ id: number; number: string; heatIds: number[] }> {
  seq += 1;
  const number = `CL-${seq}`;
  const id = (await machinist.post('/api/orders', { number, customerId, poReference: 'PO-CL', materialSpec: 'ASTM A36', geometryKey: 'astm-e8-flat-sheet-12.5', testStandard: 'ASTM E8/E8M', specimensPerHeat: 3, ...over }).expect(201)).body.id;
  const heatIds: number[] = [];
  for (const heatNumber of heatNumbers) {
    heatIds.push((await machinist.post(`/api/orders/${id}/heats`, { heat: { heatNumber, material: 'Carbon steel plate', grade: 'A36', producer: `Invented Mill ${seq}` } }).expect(201)).body.id);
  }
  return { id, number, heatIds };
}

async function counts(): Promise<{ samples: number; items: number; events: number }> {
  const [rows] = await t.owner.query(
    `SELECT (SELECT count(*)::int FROM samples) AS samples, (SELECT count(*)::int FROM items) AS items, (SELECT count(*)::int FROM custody_events) AS events`,
  );
  return (rows as { samples: number; items: number; events: number }[])[0]!;
}

function upload(path: string, content: string | Buffer, filename = 'cut-list.csv') {
  // The agent keeps the session cookie and adds the CSRF header; with no body, attach() makes it multipart.
  return machinist
    .post(path)
    .attach('file', Buffer.isBuffer(content) ? content : Buffer.from(content, 'utf8'), filename);
}

beforeAll(async () => {
  t = await createTestContext();
  machinist = await signedInAs(t, 'machinist');
  customerId = (await machinist.post('/api/customers', { name: 'Cut List Works' }).expect(201)).body.id;
});
afterAll(() => t.close());

describe('POST /api/orders/:id/cut-list', () => {
  it('makes one sample per heat and the order’s number of specimens from each, each with a registered event', async () => {
    const order = await orderWithHeats(['CA-1', 'CA-2']);
    const before = await counts();
    const res = await machinist.post(`/api/orders/${order.id}/cut-list`, { position: 'head end', orientation: 'longitudinal', thicknessMm: '10' }).expect(201);
    expect(res.body.samples).toHaveLength(2);
    expect(res.body.samples.every((s: { created: boolean }) => s.created)).toBe(true);
    expect(res.body.specimens).toHaveLength(6);
    const after = await counts();
    expect(after).toEqual({ samples: before.samples + 2, items: before.items + 6, events: before.events + 6 });
    const list = await machinist.get(`/api/specimens?orderId=${order.id}&pageSize=100`).expect(200);
    expect(list.body.total).toBe(6);
    expect(list.body.items.every((s: { state: string }) => s.state === 'registered')).toBe(true);
  });

  it('uses a given sample for its heat and a new one for the others', async () => {
    const order = await orderWithHeats(['CB-1', 'CB-2']);
    const given = (await machinist.post('/api/samples', { orderId: order.id, heatId: order.heatIds[0], position: 'tail', orientation: 'transverse' }).expect(201)).body;
    const res = await machinist.post(`/api/orders/${order.id}/cut-list`, { position: 'head', orientation: 'longitudinal', specimensPerHeat: 1, sampleIds: [given.id] }).expect(201);
    expect(res.body.samples).toEqual([
      expect.objectContaining({ id: given.id, created: false, heatNumber: 'CB-1' }),
      expect.objectContaining({ created: true, heatNumber: 'CB-2' }),
    ]);
    expect(res.body.specimens).toHaveLength(2);
  });

  it('answers 422 for a sample of another order, and writes nothing', async () => {
    const a = await orderWithHeats(['CC-1']);
    const b = await orderWithHeats(['CC-2']);
    const foreign = (await machinist.post('/api/samples', { orderId: b.id, heatId: b.heatIds[0], position: 'x', orientation: 'y' }).expect(201)).body;
    const before = await counts();
    const res = await machinist.post(`/api/orders/${a.id}/cut-list`, { position: 'head', orientation: 'longitudinal', sampleIds: [foreign.id] }).expect(422);
    expect(res.body.error.message).toContain('belongs to another order');
    expect(await counts()).toEqual(before);
  });

  it('answers 409 for an order with no heats', async () => {
    const order = await orderWithHeats([]);
    const res = await machinist.post(`/api/orders/${order.id}/cut-list`, { position: 'head', orientation: 'longitudinal' }).expect(409);
    expect(res.body.error).toMatchObject({ code: 'no_heats', message: expect.stringContaining('add its heats') });
  });

  it('answers 422 beside the fields when position and orientation are missing', async () => {
    const order = await orderWithHeats(['CD-1']);
    const res = await machinist.post(`/api/orders/${order.id}/cut-list`, { specimensPerHeat: 99 }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['position', 'orientation', 'specimensPerHeat']));
  });

  it('answers 404 for an order that does not exist', async () => {
    await machinist.post('/api/orders/99999/cut-list', { position: 'head', orientation: 'longitudinal' }).expect(404);
  });
});

describe('POST /api/orders/:id/cut-list/preview and /import', () => {
  const header = 'heat_number,position,orientation,specimens,geometry,thickness';

  it('previews a good file without writing, then imports every row in one go', async () => {
    const order = await orderWithHeats(['IM-1', 'IM-2']);
    // 0.25 in = 6.35 mm exactly (1 in = 25.4 mm, NIST SP 811).
    const csv = `\uFEFF${header}\nIM-1,head end,longitudinal,2,astm-e8-flat-sheet-12.5,6.35 mm\nim-2,"tail end, mid-width",transverse,3,astm-e8-flat-sheet-12.5,0.25 in\nIM-2,centre,longitudinal,1,astm-e8-round-6-4d,\n`;
    const before = await counts();
    const preview = await upload(`/api/orders/${order.id}/cut-list/preview`, csv).expect(200);
    expect(preview.body).toMatchObject({ ok: true, validRows: 3, totalSpecimens: 6 });
    expect(preview.body.rows.map((r: { line: number; thicknessMm: string | null; heatId: number }) => [r.line, r.thicknessMm, r.heatId])).toEqual([
      [2, '6.35', order.heatIds[0]],
      [3, '6.35', order.heatIds[1]],
      [4, null, order.heatIds[1]],
    ]);
    expect(await counts()).toEqual(before);
    const imported = await upload(`/api/orders/${order.id}/cut-list/import`, csv).expect(201);
    expect(imported.body.samples).toHaveLength(3);
    expect(imported.body.specimens).toHaveLength(6);
    expect(await counts()).toEqual({ samples: before.samples + 3, items: before.items + 6, events: before.events + 6 });
    const samples = await machinist.get(`/api/samples?orderId=${order.id}&sort=code`).expect(200);
    expect(samples.body.items.map((s: { position: string; thicknessMm: string | null }) => [s.position, s.thicknessMm])).toEqual([
      ['head end', '6.350'],
      ['tail end, mid-width', '6.350'],
      ['centre', null],
    ]);
    const round = await machinist.get(`/api/specimens?orderId=${order.id}&shape=round`).expect(200);
    expect(round.body.total).toBe(1);
  });

  it('lists each row’s errors in the preview and refuses the import whole, writing nothing', async () => {
    const order = await orderWithHeats(['BAD-1']);
    const csv = [
      header,
      'BAD-1,head,longitudinal,2,astm-e8-flat-sheet-12.5,6 mm',
      'BAD-1,head,longitudinal,2,astm-e8-flat-sheet-12.5,0.5 cm',
      'NOT-ON-ORDER,head,longitudinal,2,astm-e8-flat-sheet-12.5,',
      'BAD-1,,longitudinal,many,no-such-geometry,6',
      'BAD-1,head,longitudinal,1,astm-e8-flat-subsize-6,8 mm',
    ].join('\n');
    const preview = await upload(`/api/orders/${order.id}/cut-list/preview`, csv).expect(200);
    expect(preview.body).toMatchObject({ ok: false, validRows: 1 });
    const errs = (line: number) => preview.body.rows.find((r: { line: number }) => r.line === line).errors as { column: string; message: string }[];
    expect(errs(2)).toEqual([]);
    expect(errs(3)).toEqual([{ column: 'thickness', message: 'Thickness unit "cm" is not one Halfmark reads; write mm or in.' }]);
    expect(errs(4)).toEqual([{ column: 'heat_number', message: 'Heat NOT-ON-ORDER is not on this order; add it to the order first.' }]);
    expect(errs(5).map((e) => e.column)).toEqual(['position', 'specimens', 'geometry', 'thickness']);
    expect(errs(5).find((e) => e.column === 'thickness')!.message).toContain('no unit');
    // ASTM E8/E8M Fig. 1 subsize specimens: T ≤ 6 mm (CHECKS.md, [copy]).
    expect(errs(6)[0]!.message).toContain('thicker than');
    const before = await counts();
    const res = await upload(`/api/orders/${order.id}/cut-list/import`, csv).expect(422);
    expect(res.body.error).toMatchObject({ code: 'rows_invalid', message: expect.stringContaining('4 of 5 rows have errors, so nothing was imported') });
    expect(res.body.error.details).toEqual(expect.arrayContaining([expect.objectContaining({ line: 3, column: 'thickness' })]));
    expect(await counts()).toEqual(before);
  });

  it('answers 422 for a wrong header, naming what is missing and what is unknown', async () => {
    const order = await orderWithHeats(['HD-1']);
    const res = await upload(`/api/orders/${order.id}/cut-list/preview`, 'heat,position,orientation,specimens,geometry\nHD-1,a,b,1,astm-e8-flat-sheet-12.5\n').expect(422);
    expect(res.body.error.code).toBe('bad_header');
    expect(res.body.error.message).toContain('lacks "heat_number"');
    expect(res.body.error.message).toContain('does not read: "heat"');
  });

  it('answers 422 for an empty file and for a header with no rows', async () => {
    const order = await orderWithHeats(['EM-1']);
    const empty = await upload(`/api/orders/${order.id}/cut-list/preview`, Buffer.alloc(0)).expect(422);
    expect(empty.body.error).toMatchObject({ code: 'empty_file', message: expect.stringContaining('The file is empty') });
    const blank = await upload(`/api/orders/${order.id}/cut-list/import`, '\n\n  \n').expect(422);
    expect(blank.body.error.code).toBe('empty_file');
    const headerOnly = await upload(`/api/orders/${order.id}/cut-list/import`, `${header}\n`).expect(422);
    expect(headerOnly.body.error.code).toBe('no_rows');
  });

  it('answers 413 for a file over the size limit, and writes nothing', async () => {
    const order = await orderWithHeats(['BIG-1']);
    const row = 'BIG-1,head,longitudinal,1,astm-e8-flat-sheet-12.5,6 mm\n';
    const big = header + '\n' + row.repeat(Math.ceil(CUT_LIST_MAX_BYTES / row.length) + 1);
    const before = await counts();
    const res = await upload(`/api/orders/${order.id}/cut-list/import`, big).expect(413);
    expect(res.body.error).toMatchObject({ code: 'file_too_large', message: expect.stringContaining('larger than 1 MB') });
    expect(await counts()).toEqual(before);
  });

  it('answers 422 with no file, 415 for a spreadsheet, and 422 for bytes that are not text', async () => {
    const order = await orderWithHeats(['FT-1']);
    const none = await machinist.post(`/api/orders/${order.id}/cut-list/preview`).field('note', 'no file').expect(422);
    expect(none.body.error.code).toBe('no_file');
    const xlsx = await upload(`/api/orders/${order.id}/cut-list/preview`, Buffer.from('PK\u0003\u0004'), 'cut-list.xlsx').expect(415);
    expect(xlsx.body.error.message).toContain('Save it as "CSV UTF-8"');
    const binary = await upload(`/api/orders/${order.id}/cut-list/preview`, Buffer.from([0xff, 0xfe, 0x00, 0x41])).expect(422);
    expect(binary.body.error.code).toBe('not_text');
  });

  it('answers 422 for a row with more cells than the header', async () => {
    const order = await orderWithHeats(['RL-1']);
    const res = await upload(`/api/orders/${order.id}/cut-list/preview`, `${header}\nRL-1,a,b,1,astm-e8-flat-sheet-12.5,6 mm,extra\n`).expect(422);
    expect(res.body.error.code).toBe('bad_csv');
  });

  it('answers 403 for a technician', async () => {
    const order = await orderWithHeats(['PM-1']);
    const technician = await signedInAs(t, 'technician');
    await technician.post(`/api/orders/${order.id}/cut-list/preview`).attach('file', Buffer.from(`${header}\n`), 'c.csv').expect(403);
  });
});
