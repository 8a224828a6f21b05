/**
 * Test helpers for results and reports: a specimen taken through the ledger to `tested`, and a
 * synthetic elastic–linear-hardening force–extension record. Invented data only.
 */
import request from 'supertest';
import type { SignedInAgent } from '../factories';
import { createSpecimen, scan } from '../ledger/ledger-fixtures';
import type { LedgerActor } from '../../server/ledger/types';
import type { TestContext } from '../support';

/** Readings of a flat 12.50 × 2.00 mm specimen: S0 = 25.0000 mm² under every area policy. */
export const FLAT_25 = { shape: 'flat', width: ['12.50', '12.50', '12.50'], thickness: ['2.00', '2.00', '2.00'] };

/** Takes a new specimen of a sample through cut, measured and (unless `test` is false) tested. */
export async function testedSpecimen(
  t: TestContext,
  tech: SignedInAgent,
  actor: LedgerActor,
  sampleId: number,
  opts: { readings?: Record<string, unknown>; geometryKey?: string; tested?: Record<string, unknown> | false; measure?: boolean } = {},
): Promise<string> {
  const code = await createSpecimen(t, actor, sampleId, opts.geometryKey);
  await tech.post('/api/events', scan('cut', code)).expect(201);
  if (opts.measure === false) return code;
  await tech.post('/api/events', scan('measured', code, { payload: opts.readings ?? FLAT_25 })).expect(201);
  if (opts.tested !== false) await tech.post('/api/events', scan('tested', code, { payload: opts.tested ?? { fractured: true } })).expect(201);
  return code;
}

/** The curve: Young's modulus E, yield stress σy, hardening slope H (MPa), up to a largest strain. */
export interface SyntheticCurve {
  modulusMPa: number;
  yieldMPa: number;
  hardeningMPa: number;
  maxStrain: number;
  s0Mm2: number;
  gaugeLengthMm: number;
}

/** The curve of most tests: E 200 000 MPa, σy 300 MPa, H 2 000 MPa, to 20 % strain, S0 25 mm², Le 50 mm. */
export const STEEL_LIKE: SyntheticCurve = { modulusMPa: 200_000, yieldMPa: 300, hardeningMPa: 2_000, maxStrain: 0.2, s0Mm2: 25, gaugeLengthMm: 50 };

/** Stress at a strain on the bilinear curve σ = Eε up to σy/E, then σy + H(ε − σy/E). */
export function stressAt(c: SyntheticCurve, strain: number): number {
  const ey = c.yieldMPa / c.modulusMPa;
  return strain <= ey ? c.modulusMPa * strain : c.yieldMPa + c.hardeningMPa * (strain - ey);
}

/** Strains sampled: every 0.0001 to 1 %, then every 0.2 % to the largest strain, then five points of necking. */
export function strains(c: SyntheticCurve): number[] {
  const out: number[] = [];
  for (let i = 0; i <= 100; i++) out.push(i / 10_000);
  for (let e = 0.012; e <= c.maxStrain + 1e-12; e += 0.002) out.push(Math.round(e * 1e6) / 1e6);
  return out;
}

/**
 * The record as CSV text: time (s), force and extension, in the units asked for. Necking after the
 * largest strain drops the force by 15 % without rising again, so it is not a yield drop.
 */
export function syntheticCsv(c: SyntheticCurve, units: { force: 'N' | 'kN' | 'kip'; extension: 'mm' | 'in' } = { force: 'N', extension: 'mm' }): string {
  const forceFactor = units.force === 'N' ? 1 : units.force === 'kN' ? 1 / 1000 : 1 / 4448.2216152605;
  const lengthFactor = units.extension === 'mm' ? 1 : 1 / 25.4;
  const rows = ['Time (s),Force,Extension'];
  const points = strains(c).map((e) => [e, stressAt(c, e)] as const);
  const peak = stressAt(c, c.maxStrain);
  for (let k = 1; k <= 5; k++) points.push([c.maxStrain + k * 0.004, peak * (1 - 0.03 * k)]);
  points.forEach(([e, s], i) => {
    const force = s * c.s0Mm2 * forceFactor;
    const extension = e * c.gaugeLengthMm * lengthFactor;
    rows.push(`${(i * 0.1).toFixed(1)},${Number(force.toPrecision(15))},${Number(extension.toPrecision(15))}`);
  });
  return `${rows.join('\n')}\n`;
}

/** The upload's query for a record with the standard headers. */
export function recordQuery(over: Record<string, string> = {}): string {
  const q = new URLSearchParams({ force: 'Force', extension: 'Extension', time: 'Time (s)', forceUnit: 'N', extensionUnit: 'mm', gaugeLength: '50', gaugeLengthUnit: 'mm', ...over });
  return q.toString();
}

/** Uploads a CSV record for a specimen; returns the response. */
export function uploadCsv(t: TestContext, agent: SignedInAgent, code: string, csv: string, query = recordQuery()) {
  return request(t.app)
    .post(`/api/results/specimens/${code}/records?${query}`)
    .set('Cookie', agent.cookie)
    .set('X-CSRF-Token', agent.csrf)
    .set('Content-Type', 'text/csv')
    .send(csv);
}
