import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { parseCode, specimenCode } from '../../shared/domain/codes';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';

let t: TestContext;
let machinist: SignedInAgent;
let auditor: SignedInAgent;
let sampleId: number;

beforeAll(async () => {
  t = await createTestContext();
  machinist = await signedInAs(t, 'machinist');
  auditor = await signedInAs(t, 'auditor');
  const customerId = (await machinist.post('/api/customers', { name: 'Specimen Test Works' }).expect(201)).body.id;
  const orderId = (await machinist.post('/api/orders', { number: 'SP-1', customerId, poReference: 'P', materialSpec: 'ASTM B209 6061-T6', geometryKey: 'astm-e8-flat-sheet-12.5', testStandard: 'ASTM E8/E8M' }).expect(201)).body.id;
  const heatId = (await machinist.post(`/api/orders/${orderId}/heats`, { heat: { heatNumber: 'AL-1', material: 'Aluminium sheet', grade: '6061-T6', producer: 'Invented Rolling' } }).expect(201)).body.id;
  sampleId = (await machinist.post('/api/samples', { orderId, heatId, position: 'centre', orientation: 'longitudinal', thicknessMm: 2 }).expect(201)).body.id;
});
afterAll(() => t.close());

describe('POST /api/specimens', () => {
  it('registers a specimen with a checked code, the order’s geometry, its nominal sizes and a registered event', async () => {
    const res = await machinist.post('/api/specimens', { sampleId }).expect(201);
    const parsed = parseCode(res.body.code);
    expect(parsed).toMatchObject({ ok: true, kind: 'specimen' });
    expect(res.body).toMatchObject({ state: 'registered', shape: 'flat', geometryKey: 'astm-e8-flat-sheet-12.5', testStandard: 'ASTM E8/E8M', heatNumber: 'AL-1', orderNumber: 'SP-1' });
    // ASTM E8/E8M Fig. 1 sheet-type: W 12.5 ± 0.2 mm, G 50.0 ± 0.1 mm (CHECKS.md, [copy]).
    expect(res.body.nominal).toMatchObject({ width: { nominal: '12.5', tolerance: '0.2' }, gaugeLength: { nominal: '50.0', tolerance: '0.1' }, thickness: '2.000', standard: 'ASTM E8/E8M' });
    const [events] = await t.owner.query(`SELECT type, item_code, seq, payload FROM custody_events WHERE item_code = $1`, { bind: [res.body.code] });
    expect(events).toEqual([expect.objectContaining({ type: 'registered', seq: 1, payload: expect.objectContaining({ heat: 'AL-1', order: 'SP-1' }) })]);
  });

  it('takes another geometry when asked: a round specimen carries its diameter', async () => {
    const res = await machinist.post('/api/specimens', { sampleId, geometryKey: 'astm-e8m-round-6-5d' }).expect(201);
    expect(res.body).toMatchObject({ shape: 'round', nominal: { diameter: { nominal: '6.0', tolerance: '0.1' }, gaugeLength: { nominal: '30' } } });
  });

  it('answers 422 for a specimen with no sample, naming the field', async () => {
    const res = await machinist.post('/api/specimens', {}).expect(422);
    expect(res.body.error.details[0]).toMatchObject({ path: 'sampleId', message: expect.stringContaining('every specimen belongs to a sample') });
  });

  it('answers 422 for a sample that does not exist, and writes no item', async () => {
    const [[before]] = (await t.owner.query(`SELECT count(*)::int AS n FROM items`)) as [{ n: number }[], unknown];
    await machinist.post('/api/specimens', { sampleId: 99999 }).expect(422);
    const [[after]] = (await t.owner.query(`SELECT count(*)::int AS n FROM items`)) as [{ n: number }[], unknown];
    expect(after!.n).toBe(before!.n);
  });
});

describe('GET /api/specimens/:idOrCode', () => {
  it('finds a specimen by id, by its code, and by its code typed without hyphens in lower case', async () => {
    const made = (await machinist.post('/api/specimens', { sampleId }).expect(201)).body;
    const byId = await auditor.get(`/api/specimens/${made.id}`).expect(200);
    expect(byId.body.code).toBe(made.code);
    await auditor.get(`/api/specimens/${made.code}`).expect(200);
    const byCompact = await auditor.get(`/api/specimens/${made.code.replace(/-/g, '').toLowerCase()}`).expect(200);
    expect(byCompact.body).toMatchObject({ id: made.id, customerName: 'Specimen Test Works', grade: '6061-T6', canWrite: false });
  });

  it('answers 422 for a code whose check character is wrong, and 404 for a good code nobody registered', async () => {
    const made = (await machinist.post('/api/specimens', { sampleId }).expect(201)).body;
    const good: string = made.code;
    // Change the check character to any other character of the MOD 37-2 alphabet.
    const wrong = good.slice(0, -1) + (good.endsWith('0') ? '1' : '0');
    const res = await auditor.get(`/api/specimens/${wrong}`).expect(422);
    expect(res.body.error).toMatchObject({ code: 'check_character', message: expect.stringContaining('check character does not match') });
    await auditor.get(`/api/specimens/${specimenCode(2099, 999_999)}`).expect(404);
  });

  it('answers 422 for a container code', async () => {
    const res = await auditor.get('/api/specimens/C-00042-R').expect(422);
    expect(res.body.error.message).toContain('container code');
  });
});

describe('GET /api/specimens', () => {
  it('searches by code without hyphens and by heat, filters by sample, state and shape', async () => {
    const made = (await machinist.post('/api/specimens', { sampleId }).expect(201)).body;
    const compact = made.code.replace(/-/g, '').slice(0, -1);
    const byCode = await auditor.get(`/api/specimens?q=${compact}`).expect(200);
    expect(byCode.body.items.map((s: { code: string }) => s.code)).toEqual([made.code]);
    const flat = await auditor.get(`/api/specimens?sampleId=${sampleId}&state=registered&shape=flat&sort=code`).expect(200);
    expect(flat.body.items.every((s: { shape: string }) => s.shape === 'flat')).toBe(true);
    const codes = flat.body.items.map((s: { code: string }) => s.code);
    expect(codes).toEqual([...codes].sort());
    const round = await auditor.get(`/api/specimens?sampleId=${sampleId}&shape=round`).expect(200);
    expect(round.body.total).toBe(1);
    await auditor.get('/api/specimens?state=melted').expect(422);
  });
});

describe('PATCH /api/specimens/:idOrCode', () => {
  it('changes the geometry of a registered specimen and its nominal sizes with it', async () => {
    const made = (await machinist.post('/api/specimens', { sampleId }).expect(201)).body;
    const res = await machinist.patch(`/api/specimens/${made.code}`, { geometryKey: 'astm-e8-flat-subsize-6' }).expect(200);
    // ASTM E8/E8M Fig. 1 subsize: W 6.0 ± 0.1 mm, T ≤ 6 mm (CHECKS.md, [copy]).
    expect(res.body.nominal).toMatchObject({ width: { nominal: '6.0', tolerance: '0.1' }, maxThickness: '6' });
  });

  it('answers 409 once the specimen is past registered', async () => {
    const made = (await machinist.post('/api/specimens', { sampleId }).expect(201)).body;
    await t.owner.query(`UPDATE items SET state = 'cut' WHERE id = $1`, { bind: [made.id] });
    const res = await machinist.patch(`/api/specimens/${made.id}`, { testStandard: 'ISO 6892-1' }).expect(409);
    expect(res.body.error.message).toContain('is cut');
  });
});
