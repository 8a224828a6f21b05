/**
 * Cut lists: the samples and specimens an order's plan asks for, made in one step, either from the
 * order itself or from a CSV file. The CSV's columns, its row checks and the thickness reading live
 * here so the server and the client say the same thing about a row.
 */
import { z } from 'zod';
import { toSI } from '../domain/units';
import { getGeometry } from '../domain/specimen-geometries';
import { idField, requiredText, wholeNumber } from './intake-common';
import { ThicknessMmSchema } from './samples';

/** POST /api/orders/:id/cut-list: one sample per heat (or the given ones), then the specimens. */
export const CutListCreateSchema = z.object({
  specimensPerHeat: wholeNumber(1, 50, 'Specimens per heat is a whole number from 1 to 50.').optional(),
  position: requiredText(200, 'Say where on the product the new samples are taken.'),
  orientation: requiredText(60, 'Enter the orientation of the new samples, e.g. longitudinal.'),
  thicknessMm: ThicknessMmSchema.optional(),
  sampleIds: z
    .array(idField('A sample id is a positive whole number.'))
    .refine((ids) => new Set(ids).size === ids.length, { message: 'A sample is listed twice.' })
    .optional(),
});
export type CutListCreate = z.infer<typeof CutListCreateSchema>;

/** Largest CSV file the import reads, in bytes. */
export const CUT_LIST_MAX_BYTES = 1024 * 1024;

/** Largest number of data rows one CSV may hold. */
export const CUT_LIST_MAX_ROWS = 500;

/** Columns every cut-list CSV has, in this order in the template. */
export const CUT_LIST_REQUIRED_COLUMNS = ['heat_number', 'position', 'orientation', 'specimens', 'geometry'] as const;

/** Columns a cut-list CSV may add. */
export const CUT_LIST_OPTIONAL_COLUMNS = ['thickness'] as const;

/** A template a person can start from (invented values). */
export const CUT_LIST_TEMPLATE = `${[...CUT_LIST_REQUIRED_COLUMNS, ...CUT_LIST_OPTIONAL_COLUMNS].join(',')}
H00-00001,head end,longitudinal,2,astm-e8-flat-sheet-12.5,6.35 mm
`;

/**
 * Checks a CSV header: every required column once, nothing unknown. Matching ignores case and
 * surrounding spaces.
 *
 * @param header - The first row of the file.
 * @returns Sentences naming what is wrong; empty when the header is right.
 */
export function checkCutListHeader(header: readonly string[]): string[] {
  const names = header.map((h) => h.trim().toLowerCase());
  const known = new Set<string>([...CUT_LIST_REQUIRED_COLUMNS, ...CUT_LIST_OPTIONAL_COLUMNS]);
  const problems: string[] = [];
  const missing = CUT_LIST_REQUIRED_COLUMNS.filter((c) => !names.includes(c));
  if (missing.length > 0) problems.push(`The header lacks ${missing.map((c) => `"${c}"`).join(', ')}.`);
  const unknown = names.filter((n) => !known.has(n));
  if (unknown.length > 0) problems.push(`The header has columns Halfmark does not read: ${unknown.map((c) => `"${c}"`).join(', ')}.`);
  const twice = names.filter((n, i) => names.indexOf(n) !== i);
  if (twice.length > 0) problems.push(`The header names ${[...new Set(twice)].map((c) => `"${c}"`).join(', ')} twice.`);
  if (problems.length > 0) {
    problems.push(`Expected: ${CUT_LIST_REQUIRED_COLUMNS.join(',')} and optionally ${CUT_LIST_OPTIONAL_COLUMNS.join(',')}.`);
  }
  return problems;
}

/** The result of reading a thickness with its unit. */
export type ThicknessReading = { ok: true; mm: string | null } | { ok: false; message: string };

const THICKNESS_RE = /^(\d+(?:\.\d+)?|\.\d+)\s*([^\d\s.]\S*)?$/;
const INCH_SPELLINGS = new Set(['in', 'in.', 'inch', 'inches', '"']);
const MM_SPELLINGS = new Set(['mm', 'millimetre', 'millimetres', 'millimeter', 'millimeters']);

/**
 * Reads a thickness written with its unit ("6.35 mm", "0.25 in", "0.25in", `0.25"`) and gives it in
 * mm to three decimals, converted exactly (1 in = 25.4 mm). An empty cell means "not given".
 *
 * @param text - The cell as written.
 */
export function parseThickness(text: string): ThicknessReading {
  const cell = text.trim();
  if (cell === '') return { ok: true, mm: null };
  const m = THICKNESS_RE.exec(cell);
  if (!m) return { ok: false, message: `Thickness "${cell}" is not a number with a unit; write it like 6.35 mm or 0.25 in.` };
  const [, number, rawUnit] = m;
  if (!rawUnit) return { ok: false, message: `Thickness "${cell}" has no unit; add mm or in after the number.` };
  const unit = rawUnit.toLowerCase();
  const from = MM_SPELLINGS.has(unit) ? 'mm' : INCH_SPELLINGS.has(unit) ? 'in' : null;
  if (!from) return { ok: false, message: `Thickness unit "${rawUnit}" is not one Halfmark reads; write mm or in.` };
  const mm = toSI(number ?? '0', from);
  if (mm.lte(0)) return { ok: false, message: 'Thickness must be more than 0.' };
  if (mm.decimalPlaces() > 3) {
    // Stored to 0.001 mm; finer than that is beyond any gauge the lab reads thickness with.
    return { ok: true, mm: mm.toDecimalPlaces(3).toFixed(3) };
  }
  return { ok: true, mm: mm.toFixed(Math.max(mm.decimalPlaces(), 0)) };
}

/** One row of a cut-list CSV after reading, before the heat is looked up. */
export interface CutListCsvRow {
  /** The line in the file, counting the header as line 1. */
  line: number;
  heatNumber: string;
  position: string;
  orientation: string;
  specimens: number | null;
  geometryKey: string;
  thicknessMm: string | null;
}

/** A problem with one cell of one row. */
export interface CutListRowError {
  column: string;
  message: string;
}

/**
 * Reads and checks one data row against what needs no database: required cells, the specimen
 * count, the geometry key, the thickness and its unit, and the geometry's thickness limit.
 *
 * @param cells - The row keyed by lower-case column name.
 * @param line - Its line in the file.
 */
export function readCutListRow(cells: Record<string, string | undefined>, line: number): { row: CutListCsvRow; errors: CutListRowError[] } {
  const cell = (name: string) => (cells[name] ?? '').trim();
  const errors: CutListRowError[] = [];
  const heatNumber = cell('heat_number');
  const position = cell('position');
  const orientation = cell('orientation');
  const geometryKey = cell('geometry');
  if (!heatNumber) errors.push({ column: 'heat_number', message: 'Give the heat number.' });
  if (!position) errors.push({ column: 'position', message: 'Say where on the product the sample is taken.' });
  else if (position.length > 200) errors.push({ column: 'position', message: 'Keep the position under 201 characters.' });
  if (!orientation) errors.push({ column: 'orientation', message: 'Give the orientation, e.g. longitudinal.' });
  else if (orientation.length > 60) errors.push({ column: 'orientation', message: 'Keep the orientation under 61 characters.' });
  const count = cell('specimens');
  const specimens = /^\d+$/.test(count) ? Number(count) : null;
  if (specimens === null || specimens < 1 || specimens > 50) {
    errors.push({ column: 'specimens', message: `Specimens is a whole number from 1 to 50${count ? `, not "${count}"` : ''}.` });
  }
  const geometry = getGeometry(geometryKey);
  if (!geometry) {
    errors.push({ column: 'geometry', message: geometryKey ? `No specimen geometry has the key "${geometryKey}".` : 'Give the geometry key.' });
  }
  const thickness = parseThickness(cell('thickness'));
  let thicknessMm: string | null = null;
  if (!thickness.ok) errors.push({ column: 'thickness', message: thickness.message });
  else {
    thicknessMm = thickness.mm;
    if (thicknessMm && geometry?.shape === 'flat' && geometry.maxThickness && Number(thicknessMm) > Number(geometry.maxThickness)) {
      errors.push({ column: 'thickness', message: `${thicknessMm} mm is thicker than ${geometry.label} allows (${geometry.maxThickness} mm).` });
    }
  }
  return { row: { line, heatNumber, position, orientation, specimens, geometryKey, thicknessMm }, errors };
}

/** One row of a preview: what it will make, or why it cannot. */
export interface CutListPreviewRow extends CutListCsvRow {
  heatId: number | null;
  errors: CutListRowError[];
}

/** POST /api/orders/:id/cut-list/preview */
export interface CutListPreview {
  orderId: number;
  rows: CutListPreviewRow[];
  /** Rows without errors / all rows. */
  validRows: number;
  totalSpecimens: number;
  /** True when every row is good, so an import would write them all. */
  ok: boolean;
}

/** The answer of a cut list made from the order or imported. */
export interface CutListResult {
  orderId: number;
  samples: { id: number; code: string; heatId: number; heatNumber: string; created: boolean }[];
  specimens: { id: number; code: string; sampleId: number; heatNumber: string }[];
}
