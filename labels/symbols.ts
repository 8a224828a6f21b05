/**
 * Barcode symbols as vectors: bwip-js encodes, and we draw the modules as filled rectangles of
 * one PDF path per symbol (no raster image per symbol: smaller files and much faster for
 * sheets of many labels).
 */
import bwipjs from 'bwip-js/node';
import { LabelError } from './errors';

/** The symbologies labels use: Data Matrix (ISO/IEC 16022) and Code 128 (ISO/IEC 15417). */
export type Symbology = 'datamatrix' | 'code128';

/**
 * Quiet zone on each side, in modules. Data Matrix: 1 module (ISO/IEC 16022, as the task states;
 * from memory for the clause). Code 128: 10 modules (ISO/IEC 15417, from memory).
 */
export const QUIET_ZONE_MODULES: Readonly<Record<Symbology, number>> = {
  datamatrix: 1,
  code128: 10,
};

/** Longest code a label will carry; Halfmark's codes are far shorter. */
export const MAX_CODE_LENGTH = 32;

/** A dark rectangle in module units, origin at the symbol's top-left (quiet zone excluded). */
export interface ModuleRect {
  readonly x: number;
  readonly y: number;
  readonly w: number;
  readonly h: number;
}

/**
 * An encoded symbol. For Data Matrix the grid is `widthModules` × `heightModules`. For Code 128
 * `heightModules` is 1 and each bar spans it: the bar height is chosen by the layout.
 */
export interface EncodedSymbol {
  readonly symbology: Symbology;
  readonly text: string;
  readonly widthModules: number;
  readonly heightModules: number;
  readonly rects: readonly ModuleRect[];
}

// Printable ASCII without the space: what both symbologies carry without extended modes and
// what a keyboard-wedge scanner types back unchanged on any keyboard layout.
const CODE_PATTERN = /^[\x21-\x7e]+$/;

/**
 * Checks that a code can be printed: 1 to MAX_CODE_LENGTH printable ASCII characters.
 * Returns a person-readable reason, or undefined when the code is fine.
 */
export function codeProblem(code: unknown): string | undefined {
  if (typeof code !== 'string' || code.length === 0) return 'the code is missing';
  if (code.length > MAX_CODE_LENGTH) {
    return `the code "${code.slice(0, MAX_CODE_LENGTH)}…" is longer than ${MAX_CODE_LENGTH} characters`;
  }
  if (!CODE_PATTERN.test(code)) {
    return `the code "${code}" contains a space or a character other than printable ASCII`;
  }
  return undefined;
}

interface MatrixRaw {
  pixs: number[];
  pixx: number;
  pixy: number;
}

interface BarsRaw {
  sbs: number[];
}

function isMatrix(raw: unknown): raw is MatrixRaw {
  return typeof raw === 'object' && raw !== null && 'pixs' in raw && 'pixx' in raw && 'pixy' in raw;
}

function isBars(raw: unknown): raw is BarsRaw {
  return typeof raw === 'object' && raw !== null && 'sbs' in raw;
}

/**
 * Encodes `code` in the given symbology with bwip-js.
 * Throws LabelError('code-not-encodable') when the code is refused.
 */
export function encodeSymbol(symbology: Symbology, code: string, labelIndex?: number): EncodedSymbol {
  const problem = codeProblem(code);
  if (problem !== undefined) throw new LabelError('code-not-encodable', `Cannot print this label: ${problem}.`, labelIndex);
  let first: unknown;
  try {
    // Never pass a height for Data Matrix: it stretches the modules (STACK.md, CHECKS.md).
    first = bwipjs.raw(symbology, code, {})[0];
  } catch (err) {
    const why = err instanceof Error ? err.message : String(err);
    throw new LabelError('code-not-encodable', `Cannot encode "${code}" as ${symbology}: ${why}`, labelIndex);
  }
  if (symbology === 'datamatrix' && isMatrix(first)) return matrixSymbol(code, first);
  if (symbology === 'code128' && isBars(first)) return barsSymbol(code, first);
  throw new LabelError('code-not-encodable', `Cannot encode "${code}" as ${symbology}.`, labelIndex);
}

function matrixSymbol(text: string, raw: MatrixRaw): EncodedSymbol {
  const rects: ModuleRect[] = [];
  for (let y = 0; y < raw.pixy; y++) {
    let x = 0;
    while (x < raw.pixx) {
      if (raw.pixs[y * raw.pixx + x] !== 1) {
        x++;
        continue;
      }
      // Merge each horizontal run of dark modules into one rectangle: fewer path segments and no
      // hairline seams between neighbouring modules when a viewer anti-aliases.
      const start = x;
      while (x < raw.pixx && raw.pixs[y * raw.pixx + x] === 1) x++;
      rects.push({ x: start, y, w: x - start, h: 1 });
    }
  }
  return { symbology: 'datamatrix', text, widthModules: raw.pixx, heightModules: raw.pixy, rects };
}

function barsSymbol(text: string, raw: BarsRaw): EncodedSymbol {
  const rects: ModuleRect[] = [];
  let x = 0;
  // sbs alternates bar, space, bar, … widths in modules, starting with a bar.
  raw.sbs.forEach((width, i) => {
    if (i % 2 === 0) rects.push({ x, y: 0, w: width, h: 1 });
    x += width;
  });
  return { symbology: 'code128', text, widthModules: x, heightModules: 1, rects };
}

/** Where and how large to draw a symbol, in PDF points (origin bottom-left, y up). */
export interface SymbolPlacementPt {
  /** Left edge of the first module (quiet zone excluded). */
  readonly xPt: number;
  /** Top edge of the symbol (quiet zone excluded). */
  readonly topPt: number;
  readonly moduleWidthPt: number;
  readonly moduleHeightPt: number;
}

// Rounded to 0.001 pt, far below any printer's dot; the shortest decimal of such a double is
// at most three decimals, never in exponent form.
const num = (n: number): string => String(Math.round(n * 1000) / 1000);

/**
 * PDF content-stream text that fills the symbol's dark modules in black as one path: one
 * `re` per rectangle and a single `f`. Written as text rather than operator objects because a
 * sheet of 1,000 symbols holds some 100,000 rectangles.
 */
export function symbolContent(symbol: EncodedSymbol, at: SymbolPlacementPt): string {
  const parts: string[] = ['q 0 g'];
  for (const r of symbol.rects) {
    parts.push(
      `${num(at.xPt + r.x * at.moduleWidthPt)} ${num(at.topPt - (r.y + r.h) * at.moduleHeightPt)} ${num(r.w * at.moduleWidthPt)} ${num(r.h * at.moduleHeightPt)} re`,
    );
  }
  parts.push('f Q\n');
  return parts.join('\n');
}
