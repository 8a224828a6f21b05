import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import { createSample, managerActor } from '../ledger/ledger-fixtures';
import type { SpecificationList, SpecificationView } from '../../shared/schemas/specifications';
import type { SpecimenResultsView } from '../../shared/schemas/results';
import { testedSpecimen } from './results-fixtures';

let t: TestContext;
let manager: SignedInAgent;
let tech: SignedInAgent;

beforeAll(async () => {
  t = await createTestContext();
  manager = await signedInAs(t, 'manager');
  tech = await signedInAs(t, 'technician');
});
afterAll(async () => t?.close());

/** An invented specification: limits made up for the test, not any standard's. */
const INVENTED = {
  key: 'invented-plate-g2',
  designation: 'Invented plate standard',
  grade: 'G2',
  strengthUnit: 'MPa',
  yieldMeasure: 'offset',
  source: 'Invented for a test; no published source',
  limits: [{ property: 'tensileStrength', min: '440', max: '560', comparisonIncrement: '1' }],
};

describe('GET /api/specifications', () => {
  it('lists the built-in specifications with their sources', async () => {
    const body = (await tech.get('/api/specifications').expect(200)).body as SpecificationList;
    expect(body.canWrite).toBe(false);
    const keys = body.items.map((s) => s.key);
    expect(keys).toEqual(expect.arrayContaining(['astm-a36', 'astm-a36m', 'astm-a572-gr50', 'en10025-2-s355jr', 'astm-b209-6061-t6']));
    for (const s of body.items.filter((i) => i.builtIn)) expect(s.source.length).toBeGreaterThan(10);
    // ASTM A572 Gr 50 (CHECKS.md [copy]): yield ≥ 50 ksi, TS ≥ 65 ksi.
    const a572 = body.items.find((s) => s.key === 'astm-a572-gr50');
    expect(a572?.limits).toEqual(expect.arrayContaining([expect.objectContaining({ property: 'yieldStrength', min: '50' }), expect.objectContaining({ property: 'tensileStrength', min: '65' })]));
  });
});

describe('POST /api/specifications', () => {
  it('refuses a technician with 403', async () => {
    await tech.post('/api/specifications', INVENTED).expect(403);
  });

  it('answers 422 with field details for an invalid specification', async () => {
    const res = await manager.post('/api/specifications', { ...INVENTED, key: 'Bad Key', limits: [{ property: 'tensileStrength', min: '600', max: '500', comparisonIncrement: '1' }] }).expect(422);
    const paths = (res.body.error.details as { path: string }[]).map((d) => d.path);
    expect(paths).toEqual(expect.arrayContaining(['key', 'limits.0.max']));
  });

  it('answers 409 for a key taken by a built-in specification', async () => {
    const res = await manager.post('/api/specifications', { ...INVENTED, key: 'astm-a36' }).expect(409);
    expect(res.body.error.code).toBe('duplicate');
  });

  it('adds a specification that orders naming it are then judged against', async () => {
    const created = (await manager.post('/api/specifications', INVENTED).expect(201)).body as SpecificationView;
    expect(created).toMatchObject({ key: INVENTED.key, provenance: 'entered', builtIn: false });
    await manager.post('/api/specifications', INVENTED).expect(409);
    const list = (await manager.get('/api/specifications').expect(200)).body as SpecificationList;
    expect(list.canWrite).toBe(true);
    expect(list.items.find((s) => s.key === INVENTED.key)?.createdBy).toBe(manager.user.name);

    const { sampleId, orderId } = await createSample(t);
    await t.owner.query('UPDATE orders SET material_spec = $2 WHERE id = $1', { bind: [orderId, 'Invented-Plate G2'] });
    const code = await testedSpecimen(t, tech, await managerActor(t), sampleId);
    // 11 250 N on 25 mm² = 450 MPa, inside the invented 440–560 MPa.
    const view = (await tech.post(`/api/results/specimens/${code}`, { maxForceN: 11250 }).expect(201)).body as SpecimenResultsView;
    expect(view.specification).toMatchObject({ status: 'found', key: INVENTED.key });
    expect(view.verdict).toMatchObject({ verdict: 'conforms', summary: 'Conforms to Invented plate standard G2.' });
  });
});
