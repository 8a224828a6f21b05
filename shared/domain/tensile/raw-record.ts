/**
 * Raw force–extension records uploaded as CSV text: a small RFC 4180 reader, a look at
 * the file so a person can say which column is which (time, force, extension) and in
 * which units, and the mapped record in SI (N, mm) ready for the tensile computation.
 *
 * No instrument's own file layout is assumed: the person maps the columns. The reader is
 * written here rather than taken from csv-parse because csv-parse's entry points use
 * Node's Buffer, which a browser bundle does not have; the tests hold this reader against
 * csv-parse on awkward inputs.
 *
 * Numbers are kept as float64 for the curve (a 100,000-point record must map in well under
 * a second); where a scale is a power of ten (kN, kip) the decimal exponent is shifted in the
 * text itself, so "11.2625" kN becomes exactly 11262.5 N and not 11262.499999999998.
 */
import { type DecimalInput, toDecimal } from '../decimal-rounding';
import { MM_PER_INCH, N_PER_LBF } from '../units';

/** Force units a record's force column may be in. */
export const RECORD_FORCE_UNITS = ['N', 'kN', 'lbf', 'kip'] as const;
/** Length units a record's extension column (and the extensometer gauge length) may be in. */
export const RECORD_LENGTH_UNITS = ['mm', 'in'] as const;
/** Field separators the reader recognises. */
export const CSV_DELIMITERS = [',', ';', '\t'] as const;

/** A force unit of a record. */
export type RecordForceUnit = (typeof RECORD_FORCE_UNITS)[number];
/** A length unit of a record. */
export type RecordLengthUnit = (typeof RECORD_LENGTH_UNITS)[number];
/** A field separator. */
export type CsvDelimiter = (typeof CSV_DELIMITERS)[number];

/** Fewest data points a record may have; fewer cannot show an elastic part and a maximum. */
export const MIN_RECORD_POINTS = 10;

/** Rows shown to the person mapping the columns. */
export const SAMPLE_ROW_COUNT = 10;

/** Most cell problems listed one by one; the rest are counted. */
export const MAX_LISTED_PROBLEMS = 10;

/** One point of a record, in SI. */
export interface ForcePoint {
  readonly forceN: number;
  readonly extensionMm: number;
  /** Time as recorded, in seconds, when a time column was mapped. */
  readonly timeS?: number;
}

/** Why a record could not be read or mapped. */
export type RecordProblemCode =
  | 'empty'
  | 'unclosed-quote'
  | 'no-header'
  | 'no-force-column'
  | 'no-extension-column'
  | 'no-such-column'
  | 'duplicate-column'
  | 'missing-cell'
  | 'non-numeric'
  | 'unknown-unit'
  | 'bad-gauge-length'
  | 'bad-option'
  | 'too-few-points';

/** A problem with a record, in words a technician can act on. */
export interface RecordProblem {
  readonly code: RecordProblemCode;
  readonly message: string;
  /** Spreadsheet row (the header row counts as its row), when the problem is in one row. */
  readonly row?: number;
  /** Column header, when the problem is in one column. */
  readonly column?: string;
}

/** How to read the text. */
export interface CsvReadOptions {
  /** The field separator; detected from the header row when omitted. */
  readonly delimiter?: CsvDelimiter;
  /** 1-based row holding the column headers (rows above it are skipped); 1 by default. */
  readonly headerRow?: number;
}

/** What a person sees before mapping the columns. */
export interface CsvInspection {
  readonly delimiter: CsvDelimiter;
  readonly headers: readonly string[];
  /** The first {@link SAMPLE_ROW_COUNT} data rows, as text. */
  readonly sampleRows: readonly (readonly string[])[];
  /** Data rows below the header, blank rows not counted. */
  readonly rowCount: number;
}

/** Either a value or the problems that stopped it. */
export type RecordOutcome<T> = { readonly ok: true; readonly value: T } | { readonly ok: false; readonly problems: readonly RecordProblem[] };

/** Which column holds what: a header name (matched trimmed, then ignoring case) or a 0-based column index. */
export interface ColumnMapping {
  readonly time?: string | number;
  readonly force?: string | number;
  readonly extension?: string | number;
}

/** The units of the mapped columns. */
export interface RecordUnits {
  readonly force: RecordForceUnit;
  readonly extension: RecordLengthUnit;
}

/** The extensometer gauge length Le: a plain value is mm; otherwise its own unit. */
export type GaugeLengthInput = DecimalInput | { readonly value: DecimalInput; readonly unit: RecordLengthUnit };

/** Options of {@link mapRecord} beyond reading. */
export interface MapRecordOptions extends CsvReadOptions {
  /** ',' when numbers use a decimal comma (only with ';' or tab as separator); '.' by default. */
  readonly decimalMark?: '.' | ',';
}

/** A mapped record in SI. */
export interface RawRecord {
  readonly points: ForcePoint[];
  /** Le in mm, as an exact decimal string. */
  readonly extensometerGaugeLengthMm: string;
  readonly columns: { readonly time?: string; readonly force: string; readonly extension: string };
  readonly units: RecordUnits;
  readonly delimiter: CsvDelimiter;
}

/** One parsed CSV record (a spreadsheet row) with the row number it starts on. */
export interface CsvRow {
  readonly row: number;
  readonly cells: string[];
}

const QUOTE = 34;
const CR = 13;
const LF = 10;

/**
 * Splits CSV text into rows of cells by RFC 4180: fields may be quoted with double quotes,
 * a doubled quote inside a quoted field is one quote, quoted fields may hold separators and
 * line breaks; lines end in CRLF, LF or CR. A leading byte-order mark is dropped. Unquoted
 * cells are kept as written (a lenient reader: a quote in the middle of an unquoted field is text).
 *
 * @param text - The whole file as text.
 * @param delimiter - The field separator.
 * @returns Every row, blank rows included (as one empty cell), numbered from 1.
 * @throws RangeError when a quoted field is not closed; the message names the row it opened on.
 */
export function parseCsv(text: string, delimiter: CsvDelimiter = ','): CsvRow[] {
  const sep = delimiter.charCodeAt(0);
  const rows: CsvRow[] = [];
  const n = text.length;
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let rowNumber = 1;
  let cells: string[] = [];
  if (i >= n) return rows;
  for (;;) {
    // One field per turn of this loop.
    if (text.charCodeAt(i) === QUOTE) {
      const openedOn = rowNumber;
      let value = '';
      let start = i + 1;
      for (;;) {
        const q = text.indexOf('"', start);
        if (q < 0) throw new RangeError(`a quoted cell opened in row ${openedOn} is never closed`);
        value += text.slice(start, q);
        if (text.charCodeAt(q + 1) === QUOTE) {
          value += '"';
          start = q + 2;
          continue;
        }
        i = q + 1;
        break;
      }
      // Text after the closing quote up to the separator is kept, as lenient readers do.
      let j = i;
      while (j < n) {
        const c = text.charCodeAt(j);
        if (c === sep || c === CR || c === LF) break;
        j++;
      }
      cells.push(j > i ? value + text.slice(i, j) : value);
      i = j;
    } else {
      let j = i;
      while (j < n) {
        const c = text.charCodeAt(j);
        if (c === sep || c === CR || c === LF) break;
        j++;
      }
      cells.push(text.slice(i, j));
      i = j;
    }
    if (i >= n) {
      rows.push({ row: rowNumber, cells });
      return rows;
    }
    const c = text.charCodeAt(i);
    if (c === sep) {
      i++;
      if (i >= n) {
        cells.push('');
        rows.push({ row: rowNumber, cells });
        return rows;
      }
      continue;
    }
    // A line break ends the row.
    i += c === CR && text.charCodeAt(i + 1) === LF ? 2 : 1;
    rows.push({ row: rowNumber, cells });
    rowNumber++;
    cells = [];
    if (i >= n) return rows;
  }
}

function isBlankCells(cells: readonly (string | undefined)[]): boolean {
  return cells.every((c) => c === undefined || c.trim() === '');
}

function headerLine(text: string, headerRow: number): string {
  let start = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  for (let r = 1; r < headerRow; r++) {
    if (start >= text.length) return '';
    start = nextLine(text, lineEnd(text, start));
  }
  return text.slice(start, lineEnd(text, start));
}

/**
 * Guesses the field separator from the header row: the one of comma, semicolon and tab that
 * occurs most often outside quotes (comma when none occurs).
 *
 * @param text - The whole file as text.
 * @param headerRow - 1-based row of the headers.
 */
export function detectDelimiter(text: string, headerRow = 1): CsvDelimiter {
  const line = headerLine(text, headerRow).replace(/"[^"]*"/g, '');
  let best: CsvDelimiter = ',';
  let bestCount = 0;
  for (const d of CSV_DELIMITERS) {
    const count = line.split(d).length - 1;
    if (count > bestCount) {
      best = d;
      bestCount = count;
    }
  }
  return best;
}

/** Calls `visit` with every row's cells (blank rows included), numbered as a spreadsheet numbers them. */
function scanRows(text: string, delimiter: CsvDelimiter, visit: (row: number, cells: string[]) => void): void {
  if (text.includes('"')) {
    for (const r of parseCsv(text, delimiter)) visit(r.row, r.cells);
    return;
  }
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let row = 1;
  while (i < text.length) {
    const end = lineEnd(text, i);
    visit(row++, text.slice(i, end).split(delimiter));
    i = nextLine(text, end);
  }
}

function lineEnd(text: string, from: number): number {
  let k = from;
  while (k < text.length) {
    const c = text.charCodeAt(k);
    if (c === LF || c === CR) return k;
    k++;
  }
  return k;
}

function nextLine(text: string, end: number): number {
  return end + (text.charCodeAt(end) === CR && text.charCodeAt(end + 1) === LF ? 2 : 1);
}

/**
 * Calls `visit` for every row with where the wanted columns' cells lie in `src`: cell k is
 * src[starts[k], ends[k]), or missing when starts[k] is -1. The arrays are reused between rows.
 * Text without any quote character (what most instruments write) is scanned in place, so a
 * 100,000-row record does not become 300,000 strings; quoted text goes through {@link parseCsv}.
 */
function scanCells(
  text: string,
  delimiter: CsvDelimiter,
  wanted: readonly number[],
  visit: (row: number, src: string, starts: Int32Array, ends: Int32Array) => void,
): void {
  const starts = new Int32Array(wanted.length);
  const ends = new Int32Array(wanted.length);
  if (text.includes('"')) {
    for (const r of parseCsv(text, delimiter)) {
      let src = '';
      wanted.forEach((column, k) => {
        const cell = r.cells[column];
        starts[k] = cell === undefined ? -1 : src.length;
        src += cell ?? '';
        ends[k] = src.length;
      });
      visit(r.row, src, starts, ends);
    }
    return;
  }
  const sep = delimiter.charCodeAt(0);
  const last = Math.max(-1, ...wanted);
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let row = 1;
  while (i < text.length) {
    const end = lineEnd(text, i);
    starts.fill(-1);
    let column = 0;
    let fieldStart = i;
    for (let j = i; j <= end && column <= last; j++) {
      if (j === end || text.charCodeAt(j) === sep) {
        for (let k = 0; k < wanted.length; k++) {
          if (wanted[k] === column) {
            starts[k] = fieldStart;
            ends[k] = j;
          }
        }
        column++;
        fieldStart = j + 1;
      }
    }
    visit(row++, text, starts, ends);
    i = nextLine(text, end);
  }
}

interface TableHead {
  readonly delimiter: CsvDelimiter;
  readonly headers: string[];
  readonly headerRow: number;
}

function problem(code: RecordProblemCode, message: string, extra: { row?: number; column?: string } = {}): RecordProblem {
  return { code, message, ...extra };
}

function readHead(text: string, options: CsvReadOptions): RecordOutcome<TableHead> {
  const headerRow = options.headerRow ?? 1;
  if (!Number.isInteger(headerRow) || headerRow < 1) {
    return { ok: false, problems: [problem('bad-option', `The header row must be a whole number from 1 up, not ${String(headerRow)}.`)] };
  }
  if (options.delimiter !== undefined && !(CSV_DELIMITERS as readonly string[]).includes(options.delimiter)) {
    return { ok: false, problems: [problem('bad-option', 'The separator must be a comma, a semicolon or a tab.')] };
  }
  if (text.trim() === '') {
    return { ok: false, problems: [problem('empty', 'The file is empty.')] };
  }
  const delimiter = options.delimiter ?? detectDelimiter(text, headerRow);
  let headers: string[] | null = null;
  try {
    if (text.includes('"')) {
      headers = parseCsv(text, delimiter).find((r) => r.row === headerRow)?.cells ?? null;
    } else {
      headers = headerLine(text, headerRow).split(delimiter);
    }
  } catch (error) {
    const message = error instanceof Error ? error.message : String(error);
    return { ok: false, problems: [problem('unclosed-quote', `The file cannot be read as CSV: ${message}.`)] };
  }
  if (headers === null || isBlankCells(headers)) {
    return { ok: false, problems: [problem('no-header', `Row ${headerRow} should hold the column headers, but it is empty or missing.`)] };
  }
  return { ok: true, value: { delimiter, headers: headers.map((c) => c.trim()), headerRow } };
}

/**
 * Reads the headers and the first rows of a CSV record, so a person can map its columns.
 *
 * @param text - The whole file as text.
 * @param options - Separator (detected when omitted) and the header row (1 by default).
 * @returns The separator used, the headers, up to {@link SAMPLE_ROW_COUNT} data rows and the
 *   number of data rows; or the problems (empty file, unclosed quote, no header row).
 */
export function inspectCsv(text: string, options: CsvReadOptions = {}): RecordOutcome<CsvInspection> {
  const head = readHead(text, options);
  if (!head.ok) return head;
  const { delimiter, headers, headerRow } = head.value;
  const sampleRows: string[][] = [];
  let rowCount = 0;
  scanRows(text, delimiter, (row, cells) => {
    if (row <= headerRow || isBlankCells(cells)) return;
    rowCount++;
    if (sampleRows.length < SAMPLE_ROW_COUNT) sampleRows.push(cells);
  });
  return { ok: true, value: { delimiter, headers, sampleRows, rowCount } };
}

const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => 10 ** k);

/**
 * Reads the decimal literal text[start, end) (spaces around it allowed) multiplied by 10^shift,
 * or NaN when it is not a plain decimal literal (digits, one decimal mark, an optional exponent).
 * Up to 15 significant digits and a net exponent within ±22 are converted with one correctly
 * rounded multiplication or division of exact operands, so the result equals what Number() gives
 * for the shifted text; longer literals go through Number() itself.
 */
function readDecimal(text: string, start: number, end: number, decimalComma: boolean, shift: number): number {
  let i = start;
  let j = end;
  while (i < j && text.charCodeAt(i) === 32) i++;
  while (j > i && text.charCodeAt(j - 1) === 32) j--;
  if (i === j) return Number.NaN;
  const markCode = decimalComma ? 44 : 46;
  let negative = false;
  const first = text.charCodeAt(i);
  if (first === 43 || first === 45) {
    negative = first === 45;
    i++;
  }
  let mantissa = 0;
  let digits = 0;
  let significant = 0;
  let fraction = 0;
  let seenMark = false;
  let k = i;
  for (; k < j; k++) {
    const c = text.charCodeAt(k);
    if (c >= 48 && c <= 57) {
      digits++;
      if (significant > 0 || c !== 48) significant++;
      mantissa = mantissa * 10 + (c - 48);
      if (seenMark) fraction++;
    } else if (c === markCode && !seenMark) {
      seenMark = true;
    } else {
      break;
    }
  }
  if (digits === 0) return Number.NaN;
  let exponent = 0;
  if (k < j) {
    const e = text.charCodeAt(k);
    if (e !== 101 && e !== 69) return Number.NaN;
    k++;
    let expNegative = false;
    const sign = text.charCodeAt(k);
    if (sign === 43 || sign === 45) {
      expNegative = sign === 45;
      k++;
    }
    if (k >= j) return Number.NaN;
    for (; k < j; k++) {
      const c = text.charCodeAt(k);
      if (c < 48 || c > 57) return Number.NaN;
      exponent = exponent * 10 + (c - 48);
      if (exponent > 1e6) return Number.NaN;
    }
    if (expNegative) exponent = -exponent;
  }
  const net = exponent - fraction + shift;
  let value: number;
  if (significant <= 15 && net >= -22 && net <= 22) {
    const power = POWERS_OF_TEN[Math.abs(net)] ?? 1;
    value = net < 0 ? mantissa / power : mantissa * power;
  } else {
    const literal = text.slice(i, k).replace(',', '.').replace(/[eE].*$/, '');
    value = Number(`${literal}e${exponent + shift}`);
  }
  return negative ? -value : value;
}

const FORCE_SCALE: Record<RecordForceUnit, { shift: number; factor: number }> = {
  N: { shift: 0, factor: 1 },
  kN: { shift: 3, factor: 1 },
  lbf: { shift: 0, factor: Number(N_PER_LBF) },
  kip: { shift: 3, factor: Number(N_PER_LBF) },
};

const LENGTH_FACTOR: Record<RecordLengthUnit, number> = { mm: 1, in: Number(MM_PER_INCH) };

function resolveColumn(
  headers: readonly string[],
  ref: string | number,
): { ok: true; index: number } | { ok: false; reason: 'missing' | 'duplicate' } {
  if (typeof ref === 'number') {
    return Number.isInteger(ref) && ref >= 0 && ref < headers.length ? { ok: true, index: ref } : { ok: false, reason: 'missing' };
  }
  const wanted = ref.trim();
  const exact = headers.flatMap((h, i) => (h === wanted ? [i] : []));
  const matches = exact.length > 0 ? exact : headers.flatMap((h, i) => (h.toLowerCase() === wanted.toLowerCase() ? [i] : []));
  if (matches.length === 1 && matches[0] !== undefined) return { ok: true, index: matches[0] };
  return { ok: false, reason: matches.length === 0 ? 'missing' : 'duplicate' };
}

function describeColumns(headers: readonly string[]): string {
  return headers.map((h, i) => (h === '' ? `(column ${i + 1} has no header)` : `"${h}"`)).join(', ');
}

function columnName(headers: readonly string[], index: number): string {
  const h = headers[index];
  return h === undefined || h === '' ? `column ${index + 1}` : h;
}

function gaugeLengthMm(input: GaugeLengthInput): RecordOutcome<string> {
  const bad = (detail: string): RecordOutcome<string> => ({
    ok: false,
    problems: [problem('bad-gauge-length', `The extensometer gauge length ${detail}.`)],
  });
  const isUnitForm = typeof input === 'object' && input !== null && 'unit' in input && 'value' in input;
  const unit: unknown = isUnitForm ? input.unit : 'mm';
  if (unit !== 'mm' && unit !== 'in') {
    return { ok: false, problems: [problem('unknown-unit', `The gauge-length unit "${String(unit)}" is not one Halfmark reads; use mm or in.`)] };
  }
  let value;
  try {
    value = toDecimal(isUnitForm ? input.value : input);
  } catch {
    return bad('must be a number');
  }
  if (value.lte(0)) return bad('must be greater than zero');
  return { ok: true, value: (unit === 'in' ? value.mul(MM_PER_INCH) : value).toString() };
}

/**
 * Maps a CSV record's columns to force and extension (and optionally time), converts them to
 * N and mm, and checks every cell.
 *
 * @param text - The whole file as text.
 * @param mapping - Which column holds force, extension and (optionally) time, by header name or 0-based index.
 * @param units - The force unit (N, kN, lbf, kip) and the extension unit (mm, in); time is read as seconds.
 * @param extensometerGaugeLength - Le: a plain value in mm, or `{ value, unit }`.
 * @param options - Separator, header row, decimal mark.
 * @returns The points in SI with what was mapped; or every problem found: no force or extension
 *   column, a column that does not exist, a missing or non-numeric cell (naming row and column; the
 *   first {@link MAX_LISTED_PROBLEMS}, then a count), a unit Halfmark cannot read, a bad gauge
 *   length, fewer than {@link MIN_RECORD_POINTS} points.
 */
export function mapRecord(
  text: string,
  mapping: ColumnMapping,
  units: RecordUnits,
  extensometerGaugeLength: GaugeLengthInput,
  options: MapRecordOptions = {},
): RecordOutcome<RawRecord> {
  const problems: RecordProblem[] = [];
  const forceUnit: unknown = units.force;
  const extensionUnit: unknown = units.extension;
  if (!(RECORD_FORCE_UNITS as readonly unknown[]).includes(forceUnit)) {
    problems.push(problem('unknown-unit', `The force unit "${String(forceUnit)}" is not one Halfmark reads; use N, kN, lbf or kip.`));
  }
  if (!(RECORD_LENGTH_UNITS as readonly unknown[]).includes(extensionUnit)) {
    problems.push(problem('unknown-unit', `The extension unit "${String(extensionUnit)}" is not one Halfmark reads; use mm or in.`));
  }
  const le = gaugeLengthMm(extensometerGaugeLength);
  if (!le.ok) problems.push(...le.problems);
  const decimalMark = options.decimalMark ?? '.';
  if (decimalMark !== '.' && decimalMark !== ',') {
    problems.push(problem('bad-option', 'The decimal mark must be a point or a comma.'));
  }

  const head = readHead(text, options);
  if (!head.ok) return { ok: false, problems: [...problems, ...head.problems] };
  const { headers, headerRow, delimiter } = head.value;
  if (decimalMark === ',' && delimiter === ',') {
    problems.push(problem('bad-option', 'A decimal comma needs a semicolon or tab as the separator.'));
  }

  const columns: { key: 'time' | 'force' | 'extension'; index: number }[] = [];
  for (const key of ['force', 'extension', 'time'] as const) {
    const ref = mapping[key];
    const label = key === 'time' ? 'time' : key;
    if (ref === undefined || ref === '') {
      if (key === 'force') problems.push(problem('no-force-column', 'Choose the column that holds the force; a record without force cannot be used.'));
      if (key === 'extension') problems.push(problem('no-extension-column', 'Choose the column that holds the extension.'));
      continue;
    }
    const found = resolveColumn(headers, ref);
    if (found.ok) {
      columns.push({ key, index: found.index });
      continue;
    }
    const named = typeof ref === 'number' ? `number ${ref + 1}` : `"${ref}"`;
    const code: RecordProblemCode =
      found.reason === 'duplicate' ? 'duplicate-column' : key === 'force' ? 'no-force-column' : key === 'extension' ? 'no-extension-column' : 'no-such-column';
    const message =
      found.reason === 'duplicate'
        ? `More than one column is headed ${named}; choose the ${label} column by its position instead.`
        : `The record has no column ${named} for ${label}. Its columns are: ${describeColumns(headers)}.`;
    problems.push(problem(code, message, typeof ref === 'string' ? { column: ref } : {}));
  }
  const seen = new Set(columns.map((c) => c.index));
  if (seen.size < columns.length) {
    problems.push(problem('bad-option', 'The same column was chosen for two quantities; each needs its own column.'));
  }
  if (problems.length > 0 || !le.ok) return { ok: false, problems };

  const forceCol = columns.find((c) => c.key === 'force')?.index ?? -1;
  const extCol = columns.find((c) => c.key === 'extension')?.index ?? -1;
  const timeCol = columns.find((c) => c.key === 'time')?.index;
  const { shift, factor } = FORCE_SCALE[units.force];
  const lengthFactor = LENGTH_FACTOR[units.extension];
  const comma = decimalMark === ',';

  const cellProblems: RecordProblem[] = [];
  let cellProblemCount = 0;
  const report = (row: number, index: number, raw: string) => {
    cellProblemCount++;
    if (cellProblems.length >= MAX_LISTED_PROBLEMS) return;
    const column = columnName(headers, index);
    if (raw.trim() === '') {
      cellProblems.push(problem('missing-cell', `Row ${row} has no value in column "${column}".`, { row, column }));
      return;
    }
    const hint = !comma && /^\s*[+-]?\d+,\d+\s*$/.test(raw) ? ' (a decimal comma? choose it as the decimal mark)' : '';
    cellProblems.push(problem('non-numeric', `Row ${row}, column "${column}": "${raw}" is not a number${hint}.`, { row, column }));
  };

  const points: ForcePoint[] = [];
  const wanted = timeCol === undefined ? [forceCol, extCol] : [forceCol, extCol, timeCol];
  const shifts = [shift, 0, 0];
  const values = new Float64Array(wanted.length);
  scanCells(text, delimiter, wanted, (row, src, starts, ends) => {
    if (row <= headerRow) return;
    let blank = true;
    for (let k = 0; k < wanted.length && blank; k++) {
      const b = ends[k] ?? -1;
      for (let c = starts[k] ?? -1; c >= 0 && c < b; c++) {
        if (src.charCodeAt(c) !== 32) {
          blank = false;
          break;
        }
      }
    }
    // A row whose mapped cells are all empty is a blank row (or a trailing line of separators).
    if (blank) return;
    let good = true;
    for (let k = 0; k < wanted.length; k++) {
      const a = starts[k] ?? -1;
      const b = ends[k] ?? -1;
      const value = a < 0 ? Number.NaN : readDecimal(src, a, b, comma, shifts[k] ?? 0);
      if (Number.isNaN(value)) {
        report(row, wanted[k] ?? -1, a < 0 ? '' : src.slice(a, b));
        good = false;
      }
      values[k] = value;
    }
    if (!good) return;
    const forceN = (values[0] ?? 0) * factor;
    const extensionMm = (values[1] ?? 0) * lengthFactor;
    points.push(timeCol === undefined ? { forceN, extensionMm } : { forceN, extensionMm, timeS: values[2] ?? 0 });
  });
  if (cellProblemCount > 0) {
    const more = cellProblemCount - cellProblems.length;
    if (more > 0) {
      const last = cellProblems[cellProblems.length - 1];
      cellProblems.push(problem(last?.code ?? 'non-numeric', `…and ${more} more cell${more === 1 ? '' : 's'} like these.`));
    }
    return { ok: false, problems: cellProblems };
  }
  const count = points.length;
  if (count < MIN_RECORD_POINTS) {
    return {
      ok: false,
      problems: [
        problem('too-few-points', `The record has ${count} data point${count === 1 ? '' : 's'}; at least ${MIN_RECORD_POINTS} are needed.`),
      ],
    };
  }
  const name = (key: 'time' | 'force' | 'extension'): string | undefined => {
    const index = columns.find((c) => c.key === key)?.index;
    return index === undefined ? undefined : columnName(headers, index);
  };
  return {
    ok: true,
    value: {
      points,
      extensometerGaugeLengthMm: le.value,
      columns: {
        force: name('force') ?? '',
        extension: name('extension') ?? '',
        ...(timeCol === undefined ? {} : { time: name('time') ?? '' }),
      },
      units: { force: units.force, extension: units.extension },
      delimiter,
    },
  };
}
