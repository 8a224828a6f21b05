import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support';
import { signedInAs, type SignedInAgent } from '../factories';
import { countRows, createSample, managerActor } from '../ledger/ledger-fixtures';
import type { LedgerActor } from '../../server/ledger/types';
import type { SpecimenResultsView } from '../../shared/schemas/results';
import { FLAT_25, recordQuery, STEEL_LIKE, syntheticCsv, testedSpecimen, uploadCsv, type SyntheticCurve } from './results-fixtures';

let t: TestContext;
let tech: SignedInAgent;
let auditor: SignedInAgent;
let actor: LedgerActor;
let sampleId: number;

beforeAll(async () => {
  t = await createTestContext();
  tech = await signedInAs(t, 'technician');
  auditor = await signedInAs(t, 'auditor');
  actor = await managerActor(t);
  ({ sampleId } = await createSample(t));
});
afterAll(async () => t?.close());

const specimen = (opts: Parameters<typeof testedSpecimen>[4] = {}) => testedSpecimen(t, tech, actor, sampleId, opts);

async function save(code: string, body: Record<string, unknown>, status = 201): Promise<SpecimenResultsView> {
  const res = await tech.post(`/api/results/specimens/${code}`, body);
  expect(res.status, JSON.stringify(res.body)).toBe(status);
  return res.body as SpecimenResultsView;
}

function value(view: SpecimenResultsView, property: keyof NonNullable<SpecimenResultsView['current']>['results']['properties']): string | undefined {
  const r = view.current?.results.properties[property];
  return r?.status === 'determined' ? r.value : undefined;
}

async function uploaded(code: string, csv: string, query?: string): Promise<number> {
  const res = await uploadCsv(t, tech, code, csv, query);
  expect(res.status, JSON.stringify(res.body)).toBe(201);
  return res.body.rawRecord.id as number;
}

describe('POST /api/results/specimens/:code (entered by hand)', () => {
  it('reproduces the handbook example: d0 12.8 mm and Fmax 57 905.8 N give a tensile strength of 450 MPa', async () => {
    // Callister, Materials Science and Engineering: An Introduction, example problem on a brass
    // specimen (CHECKS.md [copy]): d0 = 12.8 mm, TS 450 MPa ⇒ Fmax = 450 · π · 12.8² / 4 = 57 905.8 N.
    // 12.8 mm lies outside the 12.5 ± 0.2 mm geometry, so the measurement carries a reason.
    const code = await specimen({
      geometryKey: 'astm-e8-round-12.5-4d',
      readings: { shape: 'round', diameter: ['12.80', '12.80', '12.80'], outOfToleranceReason: 'Handbook specimen size' },
    });
    const view = await save(code, { maxForceN: '57905.8' });
    expect(view.measurement?.s0Mm2).toBe('128.6796');
    expect(value(view, 'tensileStrength')).toBe('450');
    expect(value(view, 'maxForce')).toBe('57906');
  });

  it.each([
    // CHECKS.md [run]: widths 12.52, 12.47, 12.50 and thicknesses 1.99, 2.02, 2.00 mm at Fm 11 250 N.
    ['min-dimensions', '24.8153', '453'], // min(w)·min(t) = 24.8153 mm² → 453.35 MPa
    ['least-section', '24.9148', '452'], // least section 24.9148 mm² → 451.54 MPa
    ['mean-section', '25.0347', '449'], // mean section 25.0347 mm² → 449.38 MPa
  ] as const)('computes Rm under the %s area policy of the order', async (policy, s0, rm) => {
    const { sampleId: own } = await createSample(t, { areaPolicy: policy });
    const code = await testedSpecimen(t, tech, actor, own, {
      readings: { shape: 'flat', width: ['12.52', '12.47', '12.50'], thickness: ['1.99', '2.02', '2.00'] },
    });
    const view = await save(code, { maxForceN: 11250 });
    expect(view.current?.inputs.s0Mm2).toBe(s0);
    expect(value(view, 'tensileStrength')).toBe(rm);
  });

  it.each([
    // ASTM E29 rounding method (CHECKS.md [copy]): an exact half goes to the even neighbour, in one step.
    ['11262.5', '450'], // 11 262.5 N / 25 mm² = 450.5 MPa exactly → 450
    ['11287.5', '452'], // 451.5 MPa exactly → 452
    ['11287.6', '452'], // 451.504 MPa, above the half → 452
    ['11262.6', '451'], // 450.504 MPa → 451
  ])('rounds Rm from Fm %s N as ASTM E29 asks: %s MPa', async (fm, rm) => {
    const code = await specimen();
    expect(value(await save(code, { maxForceN: fm }), 'tensileStrength')).toBe(rm);
  });

  it('rounds A and Z to 0.5 % (ISO 6892-1, from memory) with exact halves to even, and keeps the unrounded value', async () => {
    // A = (Lu − L0)/L0: L0 50 → Lu 61.25 gives 22.5 % (CHECKS.md [memory for the clause]);
    // 61.125 gives 22.25 %, half way between 22.0 and 22.5: the even multiple (44 × 0.5) wins → 22.0.
    // 61.375 gives 22.75 % → 45.5 steps → 46 × 0.5 = 23.0.
    const cases = [
      ['61.25', '22.5', '22.5'],
      ['61.125', '22.0', '22.25'],
      ['61.375', '23.0', '22.75'],
    ] as const;
    for (const [lu, a, unrounded] of cases) {
      const code = await specimen();
      const view = await save(code, { maxForceN: 11250, finalGaugeLengthMm: lu });
      expect(value(view, 'elongation')).toBe(a);
      const r = view.current?.results.properties.elongation;
      expect(r?.status === 'determined' ? r.unrounded : null).toBe(unrounded);
      expect(view.current?.results.rounding).toMatchObject({ strength: '1', elongation: '0.5', reductionOfArea: '0.5' });
      expect(view.current?.inputs.originalGaugeLength).toEqual({ valueMm: '50.0', basis: 'geometry' });
    }
  });

  it('computes Z from the final diameter: d 12.50 → 7.50 mm gives 64.0 %', async () => {
    // Z = (S0 − Su)/S0 = 1 − (7.5/12.5)² = 0.64 (CHECKS.md [memory for the clause number]).
    const code = await specimen({ geometryKey: 'astm-e8-round-12.5-4d', readings: { shape: 'round', diameter: ['12.50', '12.50', '12.50'] } });
    const view = await save(code, { maxForceN: 50000, finalSection: { shape: 'round', diameterMm: '7.50' } });
    expect(view.current?.inputs.s0Mm2).toBe('122.7185');
    expect(value(view, 'reductionOfArea')).toBe('64.0');
    // ISO 6892-1 proportional gauge length 5.65·√S0: d 12.5 mm → 62.59 mm (CHECKS.md [run]).
    expect(view.gaugeLengthOffers.proportionalMm).toBe('62.59');
  });

  it('offers and uses the proportional gauge length 5.65·√S0: 12.5 × 2 mm → 28.25 mm', async () => {
    // CHECKS.md [run]: flat 12.5 × 2 mm → S0 25 mm², L0 = 5.65 · 5 = 28.25 mm.
    const code = await specimen();
    const view = await save(code, { maxForceN: 11250, finalGaugeLengthMm: '33.9', originalGaugeLength: { basis: 'proportional' } });
    expect(view.current?.inputs.originalGaugeLength).toEqual({ valueMm: '28.25', basis: 'proportional' });
    // (33.9 − 28.25)/28.25 = 20 % exactly.
    expect(value(view, 'elongation')).toBe('20.0');
  });

  it('reads the values an instrument posted with the tested event when none are entered', async () => {
    const code = await specimen({ tested: { fractured: true, maxForceN: 11250, finalGaugeLengthMm: '61.25' } });
    const before = (await tech.get(`/api/results/specimens/${code}`).expect(200)).body as SpecimenResultsView;
    expect(before.tested?.instrument).toEqual({ maxForceN: '11250', finalGaugeLengthMm: '61.25' });
    expect(before.current).toBeNull();
    const view = await save(code, {});
    expect(view.current?.inputs.maxForceN).toEqual({ value: '11250', from: 'instrument' });
    expect(value(view, 'tensileStrength')).toBe('450');
    expect(value(view, 'elongation')).toBe('22.5');
  });

  it('keeps every computation: a correction adds a row and becomes current', async () => {
    const code = await specimen();
    await save(code, { maxForceN: 11250 });
    const view = await save(code, { maxForceN: 11275, note: 'Fm misread from the display' });
    expect(view.history).toHaveLength(2);
    expect(value(view, 'tensileStrength')).toBe('451');
  });

  it('shows strengths in ksi converted by the exact factors: 450 MPa is 65.3 ksi', async () => {
    // NIST SP 811: 1 lbf = 4.4482216152605 N and 1 in = 25.4 mm exactly, so
    // 1 ksi = 4448.2216152605 N / 645.16 mm² = 6.894757… MPa; 450 / 6.894757 = 65.267 → 65.3.
    const code = await specimen();
    const view = await save(code, { maxForceN: 11250 });
    expect(view.current?.ksi.tensileStrength).toBe('65.3 ksi');
  });
});

describe('POST /api/results/specimens/:code (refusals)', () => {
  it('answers 409 not_measured for a specimen that was never measured, and stores nothing', async () => {
    const code = await specimen({ measure: false });
    const res = await tech.post(`/api/results/specimens/${code}`, { maxForceN: 11250 }).expect(409);
    expect(res.body.error.code).toBe('not_measured');
    expect(res.body.error.message).toContain('never measured');
    const view = (await tech.get(`/api/results/specimens/${code}`).expect(200)).body as SpecimenResultsView;
    expect(view.current).toBeNull();
    expect(view.measurement).toBeNull();
  });

  it('answers 409 not_tested for a measured specimen without a tested event', async () => {
    const code = await specimen({ tested: false });
    const res = await tech.post(`/api/results/specimens/${code}`, { maxForceN: 11250 }).expect(409);
    expect(res.body.error.code).toBe('not_tested');
  });

  it('answers 422 for a negative or zero final area, naming the field', async () => {
    const code = await specimen();
    const res = await tech.post(`/api/results/specimens/${code}`, { maxForceN: 11250, finalAreaMm2: '-3' }).expect(422);
    expect(res.body.error.details).toContainEqual({ path: 'finalAreaMm2', message: 'The final cross-section must be greater than zero.' });
    const flat = await tech.post(`/api/results/specimens/${code}`, { finalSection: { shape: 'flat', widthMm: '8', thicknessMm: '-1.2' } }).expect(422);
    expect(flat.body.error.details[0].path).toBe('finalSection.thicknessMm');
  });

  it('answers 422 bad_final_area when Su exceeds S0, and stores nothing', async () => {
    const code = await specimen();
    const res = await tech.post(`/api/results/specimens/${code}`, { maxForceN: 11250, finalAreaMm2: '30' }).expect(422);
    expect(res.body.error.code).toBe('bad_final_area');
    expect(res.body.error.message).toMatch(/^Nothing was stored: The final cross-section Su 30 mm² is larger than S0 25 mm²/);
    expect(((await tech.get(`/api/results/specimens/${code}`)).body as SpecimenResultsView).history).toHaveLength(0);
  });

  it('refuses a role without results.write with 403', async () => {
    const code = await specimen();
    await auditor.post(`/api/results/specimens/${code}`, { maxForceN: 11250 }).expect(403);
  });

  it('answers 404 for an unknown specimen code', async () => {
    const res = await tech.post('/api/results/specimens/S26-999999-X', { maxForceN: 1 }).expect(404);
    expect(res.body.error.code).toBe('not_found');
  });
});

describe('POST /api/results/specimens/:code/records', () => {
  it('answers 422 no_force_column when the mapping names a force column the file does not have', async () => {
    const code = await specimen();
    const csv = 'Time (s),Load,Extension\n0,0,0\n';
    const res = await uploadCsv(t, tech, code, csv).expect(422);
    expect(res.body.error.code).toBe('no_force_column');
    expect(res.body.error.message).toBe('The record has no column "Force" for force. Its columns are: "Time (s)", "Load", "Extension".');
    expect(res.body.error.details[0].path).toBe('force');
  });

  it('answers 422 non_numeric naming the row and column of each bad cell', async () => {
    const code = await specimen();
    const lines = syntheticCsv(STEEL_LIKE).split('\n');
    lines[4] = '0.3,12x5,0.0015';
    lines[7] = '0.6,1500,n/a';
    const res = await uploadCsv(t, tech, code, lines.join('\n')).expect(422);
    expect(res.body.error.code).toBe('non_numeric');
    expect(res.body.error.details).toEqual([
      expect.objectContaining({ path: 'body.row.5', row: 5, column: 'Force', message: 'Row 5, column "Force": "12x5" is not a number.' }),
      expect.objectContaining({ path: 'body.row.8', row: 8, column: 'Extension', message: 'Row 8, column "Extension": "n/a" is not a number.' }),
    ]);
    expect(await countRows(t, 'raw_records', 'specimen_item_id = (SELECT id FROM items WHERE code = $1)', [code])).toBe(0);
  });

  it('answers 422 unknown_unit for a unit Halfmark cannot read', async () => {
    const code = await specimen();
    const res = await uploadCsv(t, tech, code, syntheticCsv(STEEL_LIKE), recordQuery({ forceUnit: 'kgf' })).expect(422);
    expect(res.body.error.code).toBe('unknown_unit');
    expect(res.body.error.message).toBe('The force unit "kgf" is not one Halfmark reads; use N, kN, lbf or kip.');
    expect(res.body.error.details[0].path).toBe('forceUnit');
  });

  it('answers 415 when the body is not sent as CSV text', async () => {
    const code = await specimen();
    const res = await tech.post(`/api/results/specimens/${code}/records?${recordQuery()}`, { csv: 'Force' }).expect(415);
    expect(res.body.error.code).toBe('not_csv');
  });

  it('keeps a record that maps, with its SHA-256, and answers 201', async () => {
    const code = await specimen();
    const csv = syntheticCsv(STEEL_LIKE);
    const res = await uploadCsv(t, tech, code, csv).expect(201);
    const { createHash } = await import('node:crypto');
    expect(res.body.rawRecord).toMatchObject({
      sha256: createHash('sha256').update(csv).digest('hex'),
      pointCount: 101 + 95 + 5,
      columns: { force: 'Force', extension: 'Extension', time: 'Time (s)' },
      extensometerGaugeLengthMm: '50',
    });
  });
});

describe('POST /api/results/specimens/:code from a raw record', () => {
  it('computes Rp0.2 of a synthetic elastic–linear-hardening record as worked out by hand', async () => {
    // The 0.2 % offset yield strength is where the curve meets a line parallel to its elastic
    // slope shifted by 0.002 strain (CHECKS.md [doc]). For σ = Eε up to σy = 300 MPa, then
    // σ = 300 + H(ε − 0.0015) with E = 200 000 MPa and H = 2 000 MPa, the offset line is
    // σ = E(ε − 0.002). Equal where 300 + 2000ε − 3 = 200 000ε − 400, i.e. 198 000ε = 697,
    // ε = 0.0035202…, σ = 200 000 × 0.0015202… = 304.04 MPa → Rp0.2 = 304 MPa.
    // Rm: the peak at ε = 0.2 is 300 + 2000 × 0.1985 = 697 MPa; Fm = 697 × 25 = 17 425 N.
    const code = await specimen();
    const id = await uploaded(code, syntheticCsv(STEEL_LIKE));
    const view = await save(code, { rawRecordId: id, finalGaugeLengthMm: '62', material: 'steel' });
    expect(value(view, 'offsetYieldStrength')).toBe('304');
    const rp = view.current?.results.properties.offsetYieldStrength;
    expect(Number(rp?.status === 'determined' ? rp.unrounded : 0)).toBeCloseTo(300 + 2000 * (697 / 198_000 - 0.0015), 6);
    expect(value(view, 'tensileStrength')).toBe('697');
    expect(value(view, 'maxForce')).toBe('17425');
    expect(value(view, 'modulus')).toBe('200.0');
    expect(view.current?.results.properties.upperYieldStrength.status).toBe('not-determined');
    expect(view.current?.results.warnings).toEqual([]);
    expect(view.current?.inputs.rawRecord).toMatchObject({ id, pointCount: 201 });

    // The chart: thinned points with the extremes kept, the offset line, Rp0.2 and Rm marked.
    const chart = view.chart;
    expect(chart).not.toBeNull();
    expect(chart?.originalPointCount).toBe(201);
    expect(Math.max(...(chart?.points ?? []).map((p) => p.stressMPa))).toBeCloseTo(697, 6);
    expect(chart?.marks.map((m) => m.key)).toEqual(['rp02', 'rm']);
    expect(chart?.marks[0]).toMatchObject({ label: 'Rp0.2', value: '304 MPa' });
    expect(chart?.offsetLine[0]?.stressMPa).toBe(0);
    expect(chart?.offsetLine[0]?.strainPct).toBeCloseTo(0.2, 6);
  });

  it('gives the same results from the record written in kip and inches (exact factors)', async () => {
    // NIST SP 811 (CHECKS.md [copy]): 1 in = 25.4 mm and 1 lbf = 4.4482216152605 N exactly, so
    // 1 kip = 4448.2216152605 N; the file holds F / 4448.2216152605 and ΔL / 25.4.
    const code = await specimen();
    const id = await uploaded(code, syntheticCsv(STEEL_LIKE, { force: 'kip', extension: 'in' }), recordQuery({ forceUnit: 'kip', extensionUnit: 'in', gaugeLength: '2', gaugeLengthUnit: 'in' }));
    // Le given as 2 in is 50.8 mm, so strain (and the fitted modulus) scales by 50/50.8; stresses do not.
    const view = await save(code, { rawRecordId: id });
    const fm = view.current?.results.properties.maxForce;
    expect(Number(fm?.status === 'determined' ? fm.unrounded : 0)).toBeCloseTo(17425, 6);
    expect(value(view, 'tensileStrength')).toBe('697');
    expect(value(view, 'modulus')).toBe(((200_000 * 50.8) / 50 / 1000).toFixed(1));
    const upload = (await tech.get(`/api/results/specimens/${code}`)).body as SpecimenResultsView;
    expect(upload.rawRecords[0]?.extensometerGaugeLengthMm).toBe('50.8');
  });

  it('answers 422 no_elastic_part for a record with no elastic part, and reports nothing', async () => {
    // Force jumps from zero to above 40 % of the peak: no point lies in the 10–40 % window.
    const rows = ['Force,Extension', '0,0'];
    for (let i = 0; i < 20; i++) rows.push(`${15000 + i * 50},${(0.5 + i * 0.2).toFixed(2)}`);
    const code = await specimen();
    const id = await uploaded(code, rows.join('\n'), recordQuery({ time: '' }));
    const res = await tech.post(`/api/results/specimens/${code}`, { rawRecordId: id, maxForceN: 16000 }).expect(422);
    expect(res.body.error.code).toBe('no_elastic_part');
    expect(res.body.error.message).toContain('The record has no usable elastic part');
    expect(res.body.error.details[0].path).toBe('rawRecordId');
    const view = (await tech.get(`/api/results/specimens/${code}`)).body as SpecimenResultsView;
    expect(view.current).toBeNull();
    expect(view.chart).toBeNull();
  });

  it('prints the time to upload and compute a 100,000-point record', async () => {
    const curve: SyntheticCurve = { ...STEEL_LIKE };
    const rows = ['Time (s),Force,Extension'];
    const n = 100_000;
    for (let i = 0; i < n; i++) {
      const e = (i / (n - 1)) * curve.maxStrain;
      const s = e <= 0.0015 ? curve.modulusMPa * e : curve.yieldMPa + curve.hardeningMPa * (e - 0.0015);
      rows.push(`${(i * 0.01).toFixed(2)},${(s * 25).toFixed(3)},${(e * 50).toFixed(6)}`);
    }
    const csv = rows.join('\n');
    const code = await specimen();
    const started = performance.now();
    const id = await uploaded(code, csv);
    const uploadedAt = performance.now();
    const view = await save(code, { rawRecordId: id });
    const done = performance.now();
    console.log(
      `100,000-point record (${(csv.length / 1e6).toFixed(1)} MB): upload ${(uploadedAt - started).toFixed(0)} ms, compute and store ${(done - uploadedAt).toFixed(0)} ms, total ${(done - started).toFixed(0)} ms`,
    );
    expect(view.chart?.originalPointCount).toBe(n);
    expect(view.chart?.points.length).toBeLessThanOrEqual(810);
    expect(value(view, 'offsetYieldStrength')).toBe('304');
  });
});

describe('GET /api/results/specimens/:code', () => {
  it('lets an auditor read results but not write them', async () => {
    const code = await specimen();
    await save(code, { maxForceN: 11250 });
    const view = (await auditor.get(`/api/results/specimens/${code}`).expect(200)).body as SpecimenResultsView;
    expect(view.canWrite).toBe(false);
    expect(view.specimen.code).toBe(code);
    expect(view.measurement?.readings).toEqual({ width: FLAT_25.width, thickness: FLAT_25.thickness });
  });
});
