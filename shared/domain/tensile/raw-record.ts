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
    const lf = text.indexOf('\n', start);
    if (lf < 0) return '';
    start = lf + 1;
  }
  const end = text.indexOf('\n', start);
  return text.slice(start, end < 0 ? text.length : end);
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

/**
 * Calls `visit` for every row of the file with the cells at `columns` (undefined where a row is
 * short), or every cell when `columns` is 'all'. The cells array is reused between calls.
 * Text without any quote character (what most instruments write) is scanned line by line,
 * slicing only the wanted cells, so a 100,000-row record does not become 300,000 strings.
 */
function scanRows(
  text: string,
  delimiter: CsvDelimiter,
  columns: readonly number[] | 'all',
  visit: (row: number, cells: (string | undefined)[]) => void,
): void {
  if (text.includes('"')) {
    for (const r of parseCsv(text, delimiter)) {
      visit(r.row, columns === 'all' ? r.cells : columns.map((c) => r.cells[c]));
    }
    return;
  }
  const sep = delimiter.charCodeAt(0);
  const n = text.length;
  const wanted = columns === 'all' ? null : columns;
  const last = wanted === null ? Infinity : Math.max(-1, ...wanted);
  const cells: (string | undefined)[] = [];
  let i = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let row = 1;
  while (i < n) {
    let lineEnd = i;
    while (lineEnd < n) {
      const c = text.charCodeAt(lineEnd);
      if (c === LF || c === CR) break;
      lineEnd++;
    }
    if (wanted === null) {
      cells.length = 0;
      for (const cell of text.slice(i, lineEnd).split(delimiter)) cells.push(cell);
    } else {
      cells.length = wanted.length;
      cells.fill(undefined);
      let col = 0;
      let fieldStart = i;
      for (let j = i; j <= lineEnd && col <= last; j++) {
        if (j === lineEnd || text.charCodeAt(j) === sep) {
          for (let k = 0; k < wanted.length; k++) if (wanted[k] === col) cells[k] = text.slice(fieldStart, j);
          col++;
          fieldStart = j + 1;
        }
      }
    }
    visit(row, cells);
    row++;
    i = lineEnd + (text.charCodeAt(lineEnd) === CR && text.charCodeAt(lineEnd + 1) === LF ? 2 : 1);
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
      headers = headerLine(text, headerRow).replace(/\r$/, '').split(delimiter);
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
  scanRows(text, delimiter, 'all', (row, cells) => {
    if (row <= headerRow || isBlankCells(cells)) return;
    rowCount++;
    if (sampleRows.length < SAMPLE_ROW_COUNT) sampleRows.push(cells.map((c) => c ?? ''));
  });
  return { ok: true, value: { delimiter, headers, sampleRows, rowCount } };
}

const NUMBER = /^[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?$/;

/** Reads a decimal literal and multiplies it by 10^shift by moving its exponent, so no binary rounding enters twice. */
function scaledNumber(text: string, shift: number): number {
  if (shift === 0) return Number(text);
  const e = text.search(/[eE]/);
  if (e < 0) return Number(`${text}e${shift}`);
  return Number(`${text.slice(0, e)}e${Number(text.slice(e + 1)) + shift}`);
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
  const read = (row: number, index: number, raw: string | undefined): string | null => {
    const name = columnName(headers, index);
    if (raw === undefined || raw.trim() === '') {
      cellProblemCount++;
      if (cellProblems.length < MAX_LISTED_PROBLEMS) {
        cellProblems.push(problem('missing-cell', `Row ${row} has no value in column "${name}".`, { row, column: name }));
      }
      return null;
    }
    const cell = comma ? raw.trim().replace(',', '.') : raw.trim();
    if (!NUMBER.test(cell)) {
      cellProblemCount++;
      if (cellProblems.length < MAX_LISTED_PROBLEMS) {
        const hint = !comma && /^[+-]?\d+,\d+$/.test(cell) ? ' (a decimal comma? choose it as the decimal mark)' : '';
        cellProblems.push(problem('non-numeric', `Row ${row}, column "${name}": "${raw}" is not a number${hint}.`, { row, column: name }));
      }
      return null;
    }
    return cell;
  };

  const points: ForcePoint[] = [];
  const wanted = timeCol === undefined ? [forceCol, extCol] : [forceCol, extCol, timeCol];
  // A row whose mapped cells are all empty is a blank row (or a trailing line of separators) and is skipped.
  scanRows(text, delimiter, wanted, (row, cells) => {
    if (row <= headerRow || isBlankCells(cells)) return;
    const f = read(row, forceCol, cells[0]);
    const e = read(row, extCol, cells[1]);
    const t = timeCol === undefined ? null : read(row, timeCol, cells[2]);
    if (f === null || e === null || (timeCol !== undefined && t === null)) return;
    const forceN = factor === 1 ? scaledNumber(f, shift) : scaledNumber(f, shift) * factor;
    const extensionMm = lengthFactor === 1 ? Number(e) : Number(e) * lengthFactor;
    points.push(t === null ? { forceN, extensionMm } : { forceN, extensionMm, timeS: Number(t) });
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
