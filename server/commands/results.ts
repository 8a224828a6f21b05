/**
 * A specimen's tensile results: where its inputs come from (the measured event's S0, the tested
 * event's instrument values, what a technician enters, an uploaded raw record), the computation
 * (shared/domain/tensile), what is stored, and the view with its chart and verdict.
 */
import { createHash } from 'node:crypto';
import { QueryTypes, type Sequelize, type Transaction } from 'sequelize';
import { crossSectionArea, proportionalGaugeLength } from '../../shared/domain/measurement';
import { getGeometry } from '../../shared/domain/specimen-geometries';
import { formatFromSI } from '../../shared/domain/units';
import {
  computeTensile,
  thinIndices,
  type CurveAnalysis,
  type TensileProblem,
  type TensileProperty,
  type TensileResults,
} from '../../shared/domain/tensile/compute';
import { mapRecord, type CsvDelimiter, type RawRecord, type RecordProblem } from '../../shared/domain/tensile/raw-record';
import { getSpecification, judge, SPECIFICATIONS, type Specification, type SpecificationInput } from '../../shared/domain/tensile/specifications';
import {
  ResultsEntrySchema,
  TestedResultsPayloadSchema,
  type ChartView,
  type RawRecordView,
  type RecordUploadQuery,
  type ResultsInputs,
  type SpecimenResultsView,
  type SpecResolution,
  type StoredResults,
} from '../../shared/schemas/results';
import type { z } from 'zod';
import type { AppContext } from '../app';
import { AppError, conflict, notFound } from '../errors';

/** Most points the chart is sent; the thinning keeps every extreme. */
export const CHART_POINTS = 800;

/** One specimen with what it belongs to. */
export interface SpecimenRow {
  item_id: string;
  code: string;
  state: string;
  projection: { effective?: { seq: number; hash: string; type: string }[] };
  shape: 'flat' | 'round';
  geometry_key: string;
  sample_id: number;
  sample_code: string;
  thickness_mm: string | null;
  heat_number: string;
  order_id: number;
  order_number: string;
  material_spec: string;
}

interface EventRow {
  hash: string;
  seq: number;
  payload: Record<string, unknown>;
}

async function select<T extends object>(sequelize: Sequelize, sql: string, bind: unknown[], transaction?: Transaction): Promise<T[]> {
  return sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction });
}

const SPECIMEN_SQL = `
  SELECT i.id AS item_id, i.code, i.state, i.projection, sp.shape, sp.geometry_key, s.id AS sample_id, s.code AS sample_code,
         s.thickness_mm::text AS thickness_mm, h.heat_number, o.id AS order_id, o.number AS order_number, o.material_spec
    FROM items i
    JOIN specimens sp ON sp.item_id = i.id
    JOIN samples s ON s.id = sp.sample_id
    JOIN heats h ON h.id = s.heat_id
    JOIN orders o ON o.id = s.order_id`;

/** Loads a specimen by its code; 404 when no specimen has it. */
export async function loadSpecimen(sequelize: Sequelize, code: string, transaction?: Transaction): Promise<SpecimenRow> {
  const [row] = await select<SpecimenRow>(sequelize, `${SPECIMEN_SQL} WHERE i.code = $1 AND i.kind = 'specimen'`, [code.trim().toUpperCase()], transaction);
  if (!row) throw notFound(`No specimen has the code ${code}. Check the label.`);
  return row;
}

/** Loads every specimen of an order, in code order. */
export async function loadOrderSpecimens(sequelize: Sequelize, orderId: number, transaction?: Transaction): Promise<SpecimenRow[]> {
  return select<SpecimenRow>(sequelize, `${SPECIMEN_SQL} WHERE o.id = $1 ORDER BY i.code`, [orderId], transaction);
}

/** The newest event of a type that is still in force (not voided), with its payload. */
export async function effectiveEvent(sequelize: Sequelize, specimen: SpecimenRow, type: string, transaction?: Transaction): Promise<EventRow | null> {
  const effective = (specimen.projection.effective ?? []).filter((e) => e.type === type);
  const last = effective[effective.length - 1];
  if (!last) return null;
  const [row] = await select<EventRow>(sequelize, 'SELECT hash, seq, payload FROM custody_events WHERE hash = $1', [last.hash], transaction);
  return row ?? null;
}

interface Measurement {
  s0Mm2: string;
  basis: string;
  readings: Record<string, string[]>;
  event: string;
}

function readMeasurement(event: EventRow | null): Measurement | null {
  if (!event) return null;
  const area = event.payload.area as { mm2?: unknown; basis?: unknown } | undefined;
  if (typeof area?.mm2 !== 'string') return null;
  const readings: Record<string, string[]> = {};
  for (const key of ['width', 'thickness', 'diameter']) {
    const v = event.payload[key];
    if (Array.isArray(v)) readings[key] = v.map(String);
  }
  return { s0Mm2: area.mm2, basis: typeof area.basis === 'string' ? area.basis : '', readings, event: event.hash };
}

function instrumentValues(event: EventRow | null): { maxForceN?: string; finalGaugeLengthMm?: string; finalAreaMm2?: string } {
  if (!event) return {};
  const nested = event.payload.results;
  const source = typeof nested === 'object' && nested !== null ? { ...event.payload, ...(nested as Record<string, unknown>) } : event.payload;
  const parsed = TestedResultsPayloadSchema.safeParse(source);
  if (!parsed.success) return {};
  const out: { maxForceN?: string; finalGaugeLengthMm?: string; finalAreaMm2?: string } = {};
  for (const key of ['maxForceN', 'finalGaugeLengthMm', 'finalAreaMm2'] as const) {
    const v = parsed.data[key];
    if (v !== undefined && String(v).trim() !== '') out[key] = String(v).trim();
  }
  return out;
}

/** Lower-case letters and digits only, so "ASTM A572 Gr 50" finds astm-a572-gr50. */
function normalise(text: string): string {
  return text.toLowerCase().replace(/[^a-z0-9]/g, '');
}

/** Specifications a lab added, oldest first. */
export async function loadAddedSpecifications(sequelize: Sequelize): Promise<(Specification & { createdAt: string; createdBy: string })[]> {
  const rows = await select<{ body: SpecificationInput; created_at: Date; name: string }>(
    sequelize,
    'SELECT s.body, s.created_at, u.name FROM specifications s JOIN users u ON u.id = s.created_by ORDER BY s.created_at, s.key',
    [],
  );
  return rows.map((r) => ({ ...r.body, provenance: 'entered' as const, createdAt: new Date(r.created_at).toISOString(), createdBy: r.name }));
}

/** A specification by key, built in or added. */
export async function findSpecification(sequelize: Sequelize, key: string): Promise<Specification | undefined> {
  const builtIn = getSpecification(key);
  if (builtIn) return builtIn;
  const [row] = await select<{ body: SpecificationInput }>(sequelize, 'SELECT body FROM specifications WHERE key = $1', [key]);
  return row ? { ...row.body, provenance: 'entered' } : undefined;
}

/**
 * The specification an order is judged against: the one chosen for it, else the one whose key
 * its material_spec text spells (ignoring case, spaces and punctuation), else none and why.
 */
export async function resolveSpecification(
  sequelize: Sequelize,
  order: { id: number; materialSpec: string },
): Promise<{ spec: Specification | null; resolution: SpecResolution }> {
  const describe = (spec: Specification, how: 'material-spec' | 'chosen'): SpecResolution => ({
    status: 'found',
    key: spec.key,
    name: `${spec.designation} ${spec.grade}`,
    source: spec.source,
    how,
  });
  const [chosen] = await select<{ spec_key: string }>(sequelize, 'SELECT spec_key FROM order_specifications WHERE order_id = $1', [order.id]);
  if (chosen) {
    const spec = await findSpecification(sequelize, chosen.spec_key);
    if (spec) return { spec, resolution: describe(spec, 'chosen') };
  }
  const wanted = normalise(order.materialSpec);
  const added = await loadAddedSpecifications(sequelize);
  const spec = [...SPECIFICATIONS, ...added].find((s) => normalise(s.key) === wanted);
  if (spec) return { spec, resolution: describe(spec, 'material-spec') };
  return {
    spec: null,
    resolution: {
      status: 'none',
      reason: `The order's material specification "${order.materialSpec}" matches no specification in the table, so results cannot be judged. Choose one for the order, or ask a lab manager to add it.`,
    },
  };
}

/** The specification an order is judged against, chosen by hand; 404 for an unknown key. */
export async function chooseSpecification(ctx: AppContext, orderId: number, specKey: string, userId: number): Promise<void> {
  const spec = await findSpecification(ctx.sequelize, specKey);
  if (!spec) throw new AppError(422, 'unknown_specification', `No specification has the key ${specKey}.`, [{ path: 'specKey', message: 'is not in the table' }]);
  const [order] = await select<{ id: number }>(ctx.sequelize, 'SELECT id FROM orders WHERE id = $1', [orderId]);
  if (!order) throw notFound(`No order has the id ${orderId}.`);
  await ctx.sequelize.query(
    `INSERT INTO order_specifications (order_id, spec_key, chosen_by) VALUES ($1, $2, $3)
     ON CONFLICT (order_id) DO UPDATE SET spec_key = EXCLUDED.spec_key, chosen_by = EXCLUDED.chosen_by, chosen_at = now()`,
    { bind: [orderId, spec.key, userId] },
  );
}

function recordErrorCode(problem: RecordProblem | undefined): string {
  return (problem?.code ?? 'invalid').replace(/-/g, '_');
}

function problemPath(problem: RecordProblem): string {
  switch (problem.code) {
    case 'no-force-column':
      return 'force';
    case 'no-extension-column':
      return 'extension';
    case 'unknown-unit':
      return /gauge/i.test(problem.message) ? 'gaugeLengthUnit' : /force/i.test(problem.message) ? 'forceUnit' : 'extensionUnit';
    case 'bad-gauge-length':
      return 'gaugeLength';
    case 'non-numeric':
    case 'missing-cell':
      return problem.row !== undefined ? `body.row.${problem.row}` : 'body';
    default:
      return 'body';
  }
}

interface StoredMapping {
  mapping: { time?: string; force: string; extension: string };
  units: { force: string; extension: string };
  gaugeLength: { value: string; unit: string };
  delimiter?: CsvDelimiter;
  headerRow?: number;
  decimalMark?: '.' | ',';
}

function mapStored(csv: string, m: StoredMapping) {
  return mapRecord(
    csv,
    m.mapping,
    // The reader checks units itself and names any it cannot read.
    m.units as { force: 'N'; extension: 'mm' },
    { value: m.gaugeLength.value, unit: m.gaugeLength.unit as 'mm' },
    { delimiter: m.delimiter, headerRow: m.headerRow, decimalMark: m.decimalMark },
  );
}

interface RawRecordRow {
  id: string;
  sha256: string;
  size_bytes: number;
  file_name: string | null;
  csv?: string;
  mapping: StoredMapping & { extensometerGaugeLengthMm: string; columns: RawRecord['columns'] };
  point_count: number;
  created_at: Date;
}

function presentRecord(r: RawRecordRow): RawRecordView {
  return {
    id: Number(r.id),
    sha256: r.sha256,
    sizeBytes: r.size_bytes,
    fileName: r.file_name,
    pointCount: r.point_count,
    columns: r.mapping.columns,
    units: r.mapping.units,
    extensometerGaugeLengthMm: r.mapping.extensometerGaugeLengthMm,
    createdAt: new Date(r.created_at).toISOString(),
  };
}

/**
 * Keeps an uploaded raw record once its columns map: every cell numeric, units known, the
 * gauge length positive. 422 naming the first problem (and listing all) otherwise; nothing is kept.
 */
export async function uploadRawRecord(ctx: AppContext, code: string, csv: string, query: RecordUploadQuery, userId: number): Promise<RawRecordView> {
  const specimen = await loadSpecimen(ctx.sequelize, code);
  const stored: StoredMapping = {
    mapping: { force: query.force, extension: query.extension, ...(query.time ? { time: query.time } : {}) },
    units: { force: query.forceUnit, extension: query.extensionUnit },
    gaugeLength: { value: query.gaugeLength, unit: query.gaugeLengthUnit },
    ...(query.delimiter ? { delimiter: query.delimiter === 'tab' ? '\t' : query.delimiter } : {}),
    ...(query.headerRow ? { headerRow: query.headerRow } : {}),
    ...(query.decimalMark ? { decimalMark: query.decimalMark } : {}),
  };
  const outcome = mapStored(csv, stored);
  if (!outcome.ok) {
    const first = outcome.problems[0];
    throw new AppError(
      422,
      recordErrorCode(first),
      outcome.problems.length === 1 ? (first?.message ?? 'The record cannot be read.') : `${first?.message ?? ''} (${outcome.problems.length} problems; see details.)`,
      outcome.problems.map((p) => ({ path: problemPath(p), message: p.message, ...(p.row ? { row: p.row } : {}), ...(p.column ? { column: p.column } : {}) })),
    );
  }
  const sha256 = createHash('sha256').update(csv, 'utf8').digest('hex');
  const mapping = { ...stored, extensometerGaugeLengthMm: outcome.value.extensometerGaugeLengthMm, columns: outcome.value.columns };
  const [row] = await select<RawRecordRow>(
    ctx.sequelize,
    `INSERT INTO raw_records (specimen_item_id, sha256, size_bytes, file_name, csv, mapping, point_count, uploaded_by)
     VALUES ($1, $2, $3, $4, $5, $6::jsonb, $7, $8)
     RETURNING id, sha256, size_bytes, file_name, mapping, point_count, created_at`,
    [specimen.item_id, sha256, Buffer.byteLength(csv, 'utf8'), query.fileName ?? null, csv, JSON.stringify(mapping), outcome.value.points.length, userId],
  );
  if (!row) throw new Error('raw record was not stored');
  return presentRecord(row);
}

const PROBLEM_PATHS: Partial<Record<TensileProblem['code'], string>> = {
  'bad-max-force': 'maxForceN',
  'bad-gauge-length': 'rawRecordId',
  'too-few-points': 'rawRecordId',
  'no-elastic-part': 'rawRecordId',
  'no-max-force': 'rawRecordId',
  'bad-final-length': 'finalGaugeLengthMm',
  'bad-final-area': 'finalAreaMm2',
  'bad-area': 'finalAreaMm2',
  'bad-option': 'elasticWindow',
};

const round5 = (n: number): number => Math.round(n * 1e5) / 1e5;

/** The chart of a computed curve: the thinned curve, the offset line and the marked points. */
export function buildChart(curve: CurveAnalysis, results: TensileResults): ChartView {
  const keep = [curve.elastic.firstIndex, curve.elastic.lastIndex, curve.maxForceIndex];
  if (curve.offsetYield) keep.push(curve.offsetYield.afterIndex, curve.offsetYield.afterIndex + 1);
  if (curve.upperYield) keep.push(curve.upperYield.index);
  const indices = thinIndices(curve.stressMPa, CHART_POINTS, keep);
  const points = indices.map((i) => ({ strainPct: round5((curve.strain[i] ?? 0) * 100), stressMPa: round5(curve.stressMPa[i] ?? 0) }));
  const { slopeMPa, interceptMPa } = curve.elastic;
  const strainAt = (stress: number) => (stress - interceptMPa) / slopeMPa + curve.offsetStrain;
  const top = curve.offsetYield ? curve.offsetYield.stressMPa * 1.05 : (curve.stressMPa[curve.maxForceIndex] ?? 0);
  const offsetLine = [0, top].map((s) => ({ strainPct: round5(strainAt(s) * 100), stressMPa: round5(s) }));
  const marks: ChartView['marks'] = [];
  const valueOf = (p: TensileProperty) => {
    const r = results.properties[p];
    return r.status === 'determined' ? `${r.value} ${r.unit}` : '';
  };
  if (curve.offsetYield) {
    marks.push({ key: 'rp02', label: 'Rp0.2', strainPct: round5(curve.offsetYield.strain * 100), stressMPa: round5(curve.offsetYield.stressMPa), value: valueOf('offsetYieldStrength') });
  }
  if (curve.upperYield) {
    marks.push({ key: 'reh', label: 'ReH', strainPct: round5((curve.strain[curve.upperYield.index] ?? 0) * 100), stressMPa: round5(curve.upperYield.stressMPa), value: valueOf('upperYieldStrength') });
  }
  marks.push({
    key: 'rm',
    label: 'Rm',
    strainPct: round5((curve.strain[curve.maxForceIndex] ?? 0) * 100),
    stressMPa: round5(curve.stressMPa[curve.maxForceIndex] ?? 0),
    value: valueOf('tensileStrength'),
  });
  return { points, offsetLine, marks, originalPointCount: curve.stressMPa.length };
}

type Entry = z.output<typeof ResultsEntrySchema>;

function finalArea(entry: Entry): { value: string; section?: Entry['finalSection'] } | null {
  if (entry.finalAreaMm2 !== undefined) return { value: entry.finalAreaMm2 };
  const section = entry.finalSection;
  if (!section) return null;
  const area =
    section.shape === 'flat'
      ? crossSectionArea({ shape: 'flat', width: [section.widthMm], thickness: [section.thicknessMm] }).area
      : crossSectionArea({ shape: 'round', diameter: [section.diameterMm] }).area;
  return { value: area, section };
}

/**
 * Computes a specimen's results from what was entered, the instrument's values and a raw record,
 * and stores them with their inputs and the rounding applied. 409 when the specimen was never
 * measured or tested; 422 naming every problem when an input cannot be trusted (nothing stored).
 */
export async function computeSpecimenResults(ctx: AppContext, code: string, entry: Entry, userId: number): Promise<number> {
  const { sequelize } = ctx;
  const specimen = await loadSpecimen(sequelize, code);
  const measurement = readMeasurement(await effectiveEvent(sequelize, specimen, 'measured'));
  if (!measurement) {
    throw conflict(
      'not_measured',
      `${specimen.code} was never measured, so it has no cross-section S0 to compute stresses from. Record its measurement (a measured scan) first.`,
      { state: specimen.state },
    );
  }
  const tested = await effectiveEvent(sequelize, specimen, 'tested');
  if (!tested) {
    throw conflict('not_tested', `${specimen.code} has no tested event in its chain (it is ${specimen.state.replace(/_/g, ' ')}). Record the test before its results.`, {
      state: specimen.state,
    });
  }
  const instrument = instrumentValues(tested);

  let record: { points: RawRecord['points']; extensometerGaugeLengthMm: string } | null = null;
  let recordRow: RawRecordRow | null = null;
  if (entry.rawRecordId !== undefined) {
    const [found] = await select<RawRecordRow>(
      sequelize,
      'SELECT id, sha256, size_bytes, file_name, csv, mapping, point_count, created_at FROM raw_records WHERE id = $1 AND specimen_item_id = $2',
      [entry.rawRecordId, specimen.item_id],
    );
    recordRow = found ?? null;
    if (!recordRow?.csv) {
      throw new AppError(422, 'unknown_record', `Raw record ${entry.rawRecordId} was not uploaded for ${specimen.code}.`, [{ path: 'rawRecordId', message: 'is not a record of this specimen' }]);
    }
    const mapped = mapStored(recordRow.csv, recordRow.mapping);
    if (!mapped.ok) throw new AppError(422, recordErrorCode(mapped.problems[0]), mapped.problems.map((p) => p.message).join(' '), mapped.problems);
    record = { points: mapped.value.points, extensometerGaugeLengthMm: mapped.value.extensometerGaugeLengthMm };
  }

  const geometry = getGeometry(specimen.geometry_key);
  const l0 =
    entry.originalGaugeLength.basis === 'entered'
      ? (entry.originalGaugeLength.valueMm ?? '')
      : entry.originalGaugeLength.basis === 'proportional'
        ? proportionalGaugeLength(measurement.s0Mm2)
        : (geometry?.gaugeLength.nominal ?? '');
  if (l0 === '') {
    throw new AppError(422, 'no_gauge_length', `The geometry ${specimen.geometry_key} names no gauge length; choose proportional or enter L0.`, [
      { path: 'originalGaugeLength.basis', message: 'the geometry has no gauge length' },
    ]);
  }
  const maxForce = entry.maxForceN !== undefined ? { value: entry.maxForceN, from: 'entered' as const } : instrument.maxForceN ? { value: instrument.maxForceN, from: 'instrument' as const } : null;
  const lu =
    entry.finalGaugeLengthMm !== undefined
      ? { value: entry.finalGaugeLengthMm, from: 'entered' as const }
      : instrument.finalGaugeLengthMm
        ? { value: instrument.finalGaugeLengthMm, from: 'instrument' as const }
        : null;
  const enteredSu = finalArea(entry);
  const su = enteredSu ? { ...enteredSu, from: 'entered' as const } : instrument.finalAreaMm2 ? { value: instrument.finalAreaMm2, from: 'instrument' as const } : null;

  const results = computeTensile(
    {
      s0Mm2: measurement.s0Mm2,
      record,
      maxForceN: maxForce?.value ?? null,
      originalGaugeLengthMm: l0,
      finalGaugeLengthMm: lu?.value ?? null,
      finalAreaMm2: su?.value ?? null,
    },
    { material: entry.material, elasticWindow: entry.elasticWindow },
  );
  if (results.errors.length > 0) {
    const [first] = results.errors;
    throw new AppError(
      422,
      (first?.code ?? 'invalid').replace(/-/g, '_'),
      `Nothing was stored: ${results.errors.map((e) => e.message).join(' ')}`,
      results.errors.map((e) => ({ path: PROBLEM_PATHS[e.code] ?? 'body', message: e.message, blocks: e.blocks })),
    );
  }

  const inputs: ResultsInputs = {
    s0Mm2: measurement.s0Mm2,
    s0Basis: measurement.basis,
    measuredEvent: measurement.event,
    testedEvent: tested.hash,
    maxForceN: maxForce,
    originalGaugeLength: { valueMm: l0, basis: entry.originalGaugeLength.basis },
    finalGaugeLengthMm: lu,
    finalAreaMm2: su,
    rawRecord: recordRow
      ? { id: Number(recordRow.id), sha256: recordRow.sha256, pointCount: recordRow.point_count, extensometerGaugeLengthMm: recordRow.mapping.extensometerGaugeLengthMm }
      : null,
    material: entry.material ?? null,
    elasticWindow: entry.elasticWindow ?? null,
    note: entry.note ?? null,
  };
  const stored: StoredResults & { chart: ChartView | null } = {
    properties: { ...results.properties },
    warnings: [...results.warnings],
    rounding: results.rounding,
    originalGaugeLengthMm: results.originalGaugeLengthMm,
    elastic: results.curve
      ? { slopeMPa: results.curve.elastic.slopeMPa, interceptMPa: results.curve.elastic.interceptMPa, pointCount: results.curve.elastic.pointCount, rSquared: results.curve.elastic.rSquared }
      : null,
    chart: results.curve ? buildChart(results.curve, results) : null,
  };
  const [row] = await select<{ id: string }>(
    sequelize,
    `INSERT INTO specimen_results (specimen_item_id, raw_record_id, measured_event_hash, tested_event_hash, inputs, results, entered_by)
     VALUES ($1, $2, $3, $4, $5::jsonb, $6::jsonb, $7) RETURNING id`,
    [specimen.item_id, recordRow ? Number(recordRow.id) : null, measurement.event, tested.hash, JSON.stringify(inputs), JSON.stringify(stored), userId],
  );
  return Number(row?.id);
}

/** A stored results row. */
export interface ResultsRow {
  id: string;
  specimen_item_id: string;
  inputs: ResultsInputs;
  results: StoredResults & { chart: ChartView | null };
  created_at: Date;
  entered_by_name: string;
}

/** The newest results of each of these specimens, keyed by item id. */
export async function currentResults(sequelize: Sequelize, itemIds: readonly (string | number)[], transaction?: Transaction): Promise<Map<string, ResultsRow>> {
  if (itemIds.length === 0) return new Map();
  const rows = await select<ResultsRow>(
    sequelize,
    `SELECT DISTINCT ON (r.specimen_item_id) r.id, r.specimen_item_id, r.inputs, r.results, r.created_at, u.name AS entered_by_name
       FROM specimen_results r JOIN users u ON u.id = r.entered_by
      WHERE r.specimen_item_id = ANY($1::bigint[])
      ORDER BY r.specimen_item_id, r.id DESC`,
    [itemIds.map(String)],
    transaction,
  );
  return new Map(rows.map((r) => [String(r.specimen_item_id), r]));
}

const STRENGTHS: readonly TensileProperty[] = ['tensileStrength', 'offsetYieldStrength', 'upperYieldStrength'];

/** Strengths in ksi, converted exactly from the full MPa value and rounded once. */
export function ksiOf(results: StoredResults): Partial<Record<TensileProperty, string>> {
  const out: Partial<Record<TensileProperty, string>> = {};
  for (const p of STRENGTHS) {
    const r = results.properties[p];
    if (r?.status === 'determined') out[p] = formatFromSI(r.unrounded, 'ksi');
  }
  return out;
}

/** Judges stored results against the specification, with the sample's nominal thickness. */
export function verdictOf(spec: Specification | null, row: ResultsRow | undefined, thicknessMm: string | null) {
  if (!spec || !row) return null;
  return judge(spec, { properties: row.results.properties, originalGaugeLengthMm: row.results.originalGaugeLengthMm }, { thicknessMm });
}

/** GET /api/results/specimens/:code: everything the results screen shows. */
export async function buildSpecimenResults(ctx: AppContext, code: string, canWrite: boolean): Promise<SpecimenResultsView> {
  const { sequelize } = ctx;
  const specimen = await loadSpecimen(sequelize, code);
  const measurement = readMeasurement(await effectiveEvent(sequelize, specimen, 'measured'));
  const tested = await effectiveEvent(sequelize, specimen, 'tested');
  const current = (await currentResults(sequelize, [specimen.item_id])).get(String(specimen.item_id));
  const history = await select<{ id: string; created_at: Date; name: string }>(
    sequelize,
    'SELECT r.id, r.created_at, u.name FROM specimen_results r JOIN users u ON u.id = r.entered_by WHERE r.specimen_item_id = $1 ORDER BY r.id DESC',
    [specimen.item_id],
  );
  const records = await select<RawRecordRow>(
    sequelize,
    'SELECT id, sha256, size_bytes, file_name, mapping, point_count, created_at FROM raw_records WHERE specimen_item_id = $1 ORDER BY id DESC',
    [specimen.item_id],
  );
  const { spec, resolution } = await resolveSpecification(sequelize, { id: specimen.order_id, materialSpec: specimen.material_spec });
  const geometry = getGeometry(specimen.geometry_key);
  return {
    specimen: {
      code: specimen.code,
      state: specimen.state,
      shape: specimen.shape,
      geometryKey: specimen.geometry_key,
      geometryLabel: geometry?.label ?? null,
      heatNumber: specimen.heat_number,
      sampleCode: specimen.sample_code,
      sampleThicknessMm: specimen.thickness_mm,
      orderId: specimen.order_id,
      orderNumber: specimen.order_number,
      materialSpec: specimen.material_spec,
    },
    measurement,
    tested: tested ? { event: tested.hash, fractured: tested.payload.fractured === true, instrument: instrumentValues(tested) } : null,
    gaugeLengthOffers: {
      geometryMm: geometry?.gaugeLength.nominal ?? null,
      proportionalMm: measurement ? proportionalGaugeLength(measurement.s0Mm2) : null,
    },
    current: current
      ? {
          id: Number(current.id),
          createdAt: new Date(current.created_at).toISOString(),
          enteredBy: current.entered_by_name,
          inputs: current.inputs,
          results: {
            properties: current.results.properties,
            warnings: current.results.warnings,
            rounding: current.results.rounding,
            originalGaugeLengthMm: current.results.originalGaugeLengthMm,
            elastic: current.results.elastic,
          },
          ksi: ksiOf(current.results),
        }
      : null,
    history: history.map((h) => ({ id: Number(h.id), createdAt: new Date(h.created_at).toISOString(), enteredBy: h.name })),
    rawRecords: records.map(presentRecord),
    chart: current?.results.chart ?? null,
    specification: resolution,
    verdict: verdictOf(spec, current, specimen.thickness_mm),
    canWrite,
  };
}
