/**
 * Cut lists from a CSV file: read and check every row (preview), then write all rows in one
 * transaction or none (import). Columns: heat_number, position, orientation, specimens, geometry,
 * and optionally thickness with its unit.
 */
import { CsvError, parse } from 'csv-parse/sync';
import {
  CUT_LIST_MAX_ROWS,
  checkCutListHeader,
  readCutListRow,
  type CutListPreview,
  type CutListPreviewRow,
  type CutListResult,
} from '../../shared/schemas/cut-list';
import type { AppContext } from '../app';
import { AppError, notFound } from '../errors';
import { writeCutList, type CutListLine } from './create-cut-list';
import type { LedgerActor } from './record-event';

const fileError = (code: string, message: string, details?: unknown) => new AppError(422, code, message, details);

function decode(file: Buffer): string {
  try {
    return new TextDecoder('utf-8', { fatal: true }).decode(file);
  } catch {
    throw fileError('not_text', 'The file is not UTF-8 text. Save the cut list as "CSV UTF-8" and upload it again.');
  }
}

/**
 * Splits a CSV file into its header and data rows, refusing an empty file, a file that is not CSV
 * text, a wrong header, and a file with too many rows.
 *
 * @param file - The uploaded bytes.
 * @returns Each data row keyed by lower-case column name, with its line in the file.
 */
export function readCutListCsv(file: Buffer): { cells: Record<string, string>; line: number }[] {
  const text = decode(file).replace(/^\uFEFF/, '');
  if (text.trim() === '') throw fileError('empty_file', 'The file is empty. Upload a CSV with a header line and one line per sample.');
  if (text.includes('\u0000')) throw fileError('not_text', 'The file holds binary data, not CSV text. Upload the cut list saved as CSV.');
  let records: { record: string[]; info: { lines: number } }[];
  try {
    records = parse(text, { delimiter: [',', ';', '\t'], skip_empty_lines: true, trim: true, info: true }) as unknown as typeof records;
  } catch (err) {
    if (err instanceof CsvError) {
      throw fileError('bad_csv', `The file could not be read as CSV near line ${(err as CsvError & { lines?: number }).lines ?? '?'}: ${err.message.replace(/^Invalid Record Length: /, '')}`);
    }
    throw err;
  }
  const [header, ...rows] = records;
  if (!header) throw fileError('empty_file', 'The file is empty. Upload a CSV with a header line and one line per sample.');
  const problems = checkCutListHeader(header.record);
  if (problems.length > 0) throw fileError('bad_header', `The first line is not a cut-list header. ${problems.join(' ')}`, problems.map((message) => ({ path: 'header', message })));
  if (rows.length === 0) throw fileError('no_rows', 'The file has a header but no rows. Add one line per sample below the header.');
  if (rows.length > CUT_LIST_MAX_ROWS) throw fileError('too_many_rows', `The file has ${rows.length} rows; one import takes at most ${CUT_LIST_MAX_ROWS}. Split it into smaller files.`);
  const names = header.record.map((h) => h.trim().toLowerCase());
  return rows.map(({ record, info }) => ({
    cells: Object.fromEntries(names.map((n, i) => [n, record[i] ?? ''])),
    line: info.lines,
  }));
}

/**
 * Checks every row of a cut-list CSV against the order: the row's own cells, and that its heat
 * number names exactly one heat on the order. Writes nothing.
 *
 * @param ctx - The app context.
 * @param orderId - The order the cut list is for.
 * @param file - The uploaded bytes.
 */
export async function previewCutList(ctx: AppContext, orderId: number, file: Buffer): Promise<CutListPreview> {
  const [orders] = await ctx.sequelize.query(`SELECT id FROM orders WHERE id = $1`, { bind: [orderId] });
  if ((orders as unknown[]).length === 0) throw notFound(`No order has id ${orderId}.`);
  const data = readCutListCsv(file);
  const [heatRows] = await ctx.sequelize.query(
    `SELECT h.id, h.heat_number, h.producer FROM order_heats oh JOIN heats h ON h.id = oh.heat_id WHERE oh.order_id = $1`,
    { bind: [orderId] },
  );
  const heats = heatRows as { id: number; heat_number: string; producer: string }[];
  const rows: CutListPreviewRow[] = data.map(({ cells, line }) => {
    const { row, errors } = readCutListRow(cells, line);
    let heatId: number | null = null;
    if (row.heatNumber) {
      const matches = heats.filter((h) => h.heat_number.toLowerCase() === row.heatNumber.toLowerCase());
      if (matches.length === 1) heatId = matches[0]!.id;
      else if (matches.length === 0) errors.push({ column: 'heat_number', message: `Heat ${row.heatNumber} is not on this order; add it to the order first.` });
      else errors.push({ column: 'heat_number', message: `Two heats on this order are numbered ${row.heatNumber} (${matches.map((m) => m.producer).join(', ')}); make a cut list for them on the order page instead.` });
    }
    return { ...row, heatId, errors };
  });
  const valid = rows.filter((r) => r.errors.length === 0);
  return {
    orderId,
    rows,
    validRows: valid.length,
    totalSpecimens: valid.reduce((sum, r) => sum + (r.specimens ?? 0), 0),
    ok: valid.length === rows.length,
  };
}

/**
 * Imports a cut-list CSV: every row becomes a sample with its specimens, in one transaction, or,
 * when any row has an error, nothing is written and the answer lists each row's errors.
 *
 * @param ctx - The app context.
 * @param orderId - The order.
 * @param file - The uploaded bytes.
 * @param actor - Who registers the specimens.
 */
export async function importCutList(ctx: AppContext, orderId: number, file: Buffer, actor: LedgerActor): Promise<CutListResult> {
  const preview = await previewCutList(ctx, orderId, file);
  if (!preview.ok) {
    const bad = preview.rows.filter((r) => r.errors.length > 0);
    throw new AppError(
      422,
      'rows_invalid',
      `${bad.length} of ${preview.rows.length} rows have errors, so nothing was imported. Fix them and upload the file again.`,
      bad.flatMap((r) => r.errors.map((e) => ({ path: `line ${r.line}.${e.column}`, message: e.message, line: r.line, column: e.column }))),
    );
  }
  const lines: CutListLine[] = preview.rows.map((r) => ({
    newSample: { heatId: r.heatId!, position: r.position, orientation: r.orientation, thicknessMm: r.thicknessMm },
    count: r.specimens!,
    geometryKey: r.geometryKey,
  }));
  return ctx.sequelize.transaction((transaction) => writeCutList(ctx, orderId, lines, actor, transaction));
}
