import { AREA_POLICIES, checkReadings, crossSectionArea, MeasurementPayloadSchema, type AreaPolicy, type Readings } from '../../shared/domain/measurement';
import { getGeometry } from '../../shared/domain/specimen-geometries';
import type { EventError } from './types';

/** A measured payload as stored: the readings, the area under the order's policy, and any flags. */
export type MeasuredResult =
  | { ok: true; payload: Record<string, unknown>; flags: string[] }
  | { ok: false; status: 422; error: EventError };

/** The order's area policy, or the default when the specimen has no order (or an unknown one). */
export function areaPolicyOf(value: string | null): AreaPolicy {
  return (AREA_POLICIES as readonly string[]).includes(value ?? '') ? (value as AreaPolicy) : 'min-dimensions';
}

/**
 * Checks a measured payload against the specimen's geometry and completes it: three readings
 * per dimension, each within the geometry's tolerance unless a reason is given (then the event
 * is flagged), and the area S0 computed under the order's policy. The stored payload keeps the
 * client's other members; `area`, `geometry` and `outOfTolerance` are always the server's.
 */
export function completeMeasuredPayload(
  code: string,
  geometryKey: string | null,
  policy: AreaPolicy,
  payload: Record<string, unknown>,
): MeasuredResult {
  const parsed = MeasurementPayloadSchema.safeParse(payload);
  if (!parsed.success) {
    return {
      ok: false,
      status: 422,
      error: {
        code: 'invalid',
        message: 'The measurement is not complete; see details.',
        details: parsed.error.issues.map((issue) => ({ path: ['payload', ...issue.path].join('.'), message: issue.message })),
      },
    };
  }
  const geometry = geometryKey === null ? undefined : getGeometry(geometryKey);
  if (geometry === undefined) {
    return {
      ok: false,
      status: 422,
      error: { code: 'no_geometry', message: `${code} has no known geometry on record, so its readings cannot be checked.` },
    };
  }
  const m = parsed.data;
  const readings: Readings =
    m.shape === 'flat' ? { shape: 'flat', width: m.width, thickness: m.thickness } : { shape: 'round', diameter: m.diameter };
  let issues;
  try {
    issues = checkReadings(geometry, readings);
  } catch (error) {
    return {
      ok: false,
      status: 422,
      error: { code: 'readings_mismatch', message: `${code}: ${(error as Error).message}.` },
    };
  }
  if (issues.length > 0 && m.outOfToleranceReason === undefined) {
    return {
      ok: false,
      status: 422,
      error: {
        code: 'out_of_tolerance',
        message: `${issues.map((i) => i.message).join(' ')} Measure again, or give outOfToleranceReason to accept the specimen as it is.`,
        details: issues.map((i) => ({ path: `payload.${i.dimension}.${i.index}`, message: i.message })),
      },
    };
  }
  const area = crossSectionArea(readings, policy);
  const out: Record<string, unknown> = { ...payload, ...readings, geometry: geometry.key };
  out.area = { policy: area.policy, mm2: area.area, basis: area.basis, sections: [...area.sections] };
  delete out.outOfTolerance;
  delete out.outOfToleranceReason;
  if (m.outOfToleranceReason !== undefined) out.outOfToleranceReason = m.outOfToleranceReason;
  if (issues.length > 0) {
    out.outOfTolerance = issues.map((i) => ({ dimension: i.dimension, index: i.index, value: i.value, status: i.status, allowed: i.allowed }));
  }
  return { ok: true, payload: out, flags: issues.length > 0 ? ['out_of_tolerance'] : [] };
}
