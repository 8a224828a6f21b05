/**
 * What goes where on each kind of label. Pure geometry and text fitting: no PDF here.
 *
 * Geometry is in millimetres from the label's top-left corner; font sizes are in points.
 */
import { LabelError } from './errors';
import type { Stock } from './stocks';
import { type EncodedSymbol, QUIET_ZONE_MODULES, type Symbology } from './symbols';

/** A specimen as machined: its code, heat and order, and optionally geometry/standard. */
export interface SpecimenLabel {
  code: string;
  heat: string;
  order: string;
  /** A short free line, e.g. "Flat 12.5 mm · tensile". */
  specimenLine?: string;
}

/** Half B of a broken specimen: it gets its own code, and names the specimen it came from. */
export interface HalfLabel {
  code: string;
  specimenCode: string;
  heat: string;
  order: string;
}

/** A bag for retained halves. */
export interface BagLabel {
  code: string;
  title: string;
  lines: string[];
}

/** A bin, box, shelf or cart. */
export interface ContainerLabel {
  code: string;
  containerType: string;
  name: string;
}

/** A person's badge card, scanned to switch the operator at a shared station. */
export interface BadgeLabel {
  code: string;
  name: string;
  role: string;
}

/** The label data for each kind. */
export interface LabelDataByKind {
  specimen: SpecimenLabel;
  half: HalfLabel;
  bag: BagLabel;
  container: ContainerLabel;
  badge: BadgeLabel;
}

export type LabelKind = keyof LabelDataByKind;

/** Every label kind, in a stable order. */
export const LABEL_KINDS: readonly LabelKind[] = ['specimen', 'half', 'bag', 'container', 'badge'];

/**
 * Which symbology each kind carries. Specimens and halves are small and read by 2D imagers and
 * phones: Data Matrix. Containers, bags and badges are read from further away and by linear
 * scanners too: Code 128.
 */
export const SYMBOLOGY_BY_KIND: Readonly<Record<LabelKind, Symbology>> = {
  specimen: 'datamatrix',
  half: 'datamatrix',
  bag: 'code128',
  container: 'code128',
  badge: 'code128',
};

/** The faces labels use: Inter 400, Inter 600 and JetBrains Mono 400 (for codes). */
export type Face = 'regular' | 'bold' | 'mono';

/** One line of text before fitting. */
export interface TextLine {
  readonly text: string;
  readonly face: Face;
  /** Size relative to the block's base size. */
  readonly scale: number;
  /** Codes are never cut short: they shrink until they fit. Other lines end in "…" if needed. */
  readonly keep: boolean;
}

const line = (text: string, face: Face, scale: number, keep = false): TextLine => ({ text, face, scale, keep });

/** Text of a label: `head` is the block beside or above the symbol; `hri` sits under a linear symbol. */
export interface LabelText {
  readonly head: readonly TextLine[];
  readonly hri?: TextLine;
}

/**
 * The text lines of one label.
 * Lines with empty text are left out.
 */
export function labelText<K extends LabelKind>(kind: K, data: LabelDataByKind[K]): LabelText {
  const d: LabelDataByKind[LabelKind] = data;
  const head = (lines: TextLine[]): TextLine[] => lines.filter((l) => l.text.trim() !== '');
  switch (kind) {
    case 'specimen': {
      const s = d as SpecimenLabel;
      return {
        head: head([
          line(s.code, 'mono', 1.15, true),
          line(`Heat ${s.heat}`, 'bold', 1),
          line(`Order ${s.order}`, 'regular', 1),
          line(s.specimenLine ?? '', 'regular', 0.85),
        ]),
      };
    }
    case 'half': {
      const h = d as HalfLabel;
      return {
        head: head([
          line(h.code, 'mono', 1.15, true),
          line(`Half B of ${h.specimenCode}`, 'regular', 0.9),
          line(`Heat ${h.heat}`, 'bold', 1),
          line(`Order ${h.order}`, 'regular', 1),
        ]),
      };
    }
    case 'bag': {
      const b = d as BagLabel;
      return {
        head: head([line(b.title, 'bold', 1.2), ...b.lines.map((l) => line(l, 'regular', 1))]),
        hri: line(b.code, 'mono', 1, true),
      };
    }
    case 'container': {
      const c = d as ContainerLabel;
      return {
        head: head([line(c.containerType, 'regular', 0.8), line(c.name, 'bold', 1.4)]),
        hri: line(c.code, 'mono', 1, true),
      };
    }
    case 'badge': {
      const b = d as BadgeLabel;
      return {
        head: head([line(b.name, 'bold', 1.5), line(b.role, 'regular', 1)]),
        hri: line(b.code, 'mono', 1, true),
      };
    }
    default:
      throw new LabelError('unknown-kind', `There is no label kind "${String(kind)}".`);
  }
}

/** A rectangle in mm from the label's top-left corner. */
export interface RectMm {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

/** Where a symbol goes on a label and how large its modules are. */
export interface SymbolPlan {
  readonly symbology: Symbology;
  /** The dark area (quiet zone excluded). */
  readonly symbol: RectMm;
  /** The symbol with its quiet zone: nothing else is drawn inside it. */
  readonly withQuietZone: RectMm;
  /** Width of one module (the X dimension). */
  readonly moduleMm: number;
  /** Module height: equal to the width for Data Matrix, the bar height for Code 128. */
  readonly moduleHeightMm: number;
}

/** The full layout of one label, before text is fitted. */
export interface LabelPlan {
  readonly symbol: SymbolPlan;
  /** Where the head text block goes. */
  readonly headBox: RectMm;
  /** Largest base size for text on this label: larger labels get larger text. */
  readonly textMaxPt: number;
  /** Where the human-readable code goes under a linear symbol. */
  readonly hriBox?: RectMm;
}

/**
 * Smallest Data Matrix module we print: 0.375 mm (3 dots at 8 dots/mm) keeps a symbol readable
 * by a phone camera at a normal holding distance (common practice).
 */
export const MIN_DATAMATRIX_MODULE_MM = 0.375;
/** Largest Data Matrix module: beyond 1.5 mm the symbol only takes room from the text. */
export const MAX_DATAMATRIX_MODULE_MM = 1.5;
/**
 * Code 128 X dimension limits: 0.25 mm is the usual minimum for general scanning (common
 * practice; application standards set their own); above 0.5 mm the symbol only gets longer.
 */
export const MIN_CODE128_MODULE_MM = 0.25;
export const MAX_CODE128_MODULE_MM = 0.5;
/**
 * Minimum bar height: the larger of 6.35 mm (¼ in) and 15 % of the symbol's length, an old
 * rule of thumb for linear symbols (common practice, from memory).
 */
export const MIN_BAR_HEIGHT_MM = 6.35;
export const MIN_BAR_HEIGHT_RATIO = 0.15;

const GAP_MM = 1;
const HRI_HEIGHT_RATIO = 0.1;
/** White between the bars and the human-readable code under them. */
const HRI_GAP_MM = 0.5;

/** Largest multiple of `dot` not above `value` (with a tiny tolerance for float error). */
function snapDown(value: number, dot: number): number {
  return Math.floor(value / dot + 1e-9) * dot;
}

/**
 * Lays out one label of `kind` carrying `symbol` on `stock`.
 * Throws LabelError('code-too-long-for-stock') when the symbol cannot be printed large enough.
 */
export function planLabel(kind: LabelKind, stock: Stock, symbol: EncodedSymbol, labelIndex?: number): LabelPlan {
  const pad = stock.paddingMm;
  const inner: RectMm = {
    x: pad,
    y: pad,
    width: stock.labelWidthMm - 2 * pad,
    height: stock.labelHeightMm - 2 * pad,
  };
  // About six lines of text to the label's height, between 11 pt and 20 pt.
  const textMaxPt = Math.min(20, Math.max(11, (inner.height / MM_PER_PT) * 0.16));
  const plan =
    SYMBOLOGY_BY_KIND[kind] === 'datamatrix'
      ? planMatrixLabel(stock, inner, symbol, labelIndex)
      : planLinearLabel(stock, inner, symbol, labelIndex);
  return { ...plan, textMaxPt };
}

function tooLong(symbol: EncodedSymbol, stock: Stock, labelIndex: number | undefined): LabelError {
  return new LabelError(
    'code-too-long-for-stock',
    `The code "${symbol.text}" is too long to print readably on ${stock.name}; choose a larger stock.`,
    labelIndex,
  );
}

// Data Matrix on the left, vertically centred; text to its right.
function planMatrixLabel(stock: Stock, inner: RectMm, symbol: EncodedSymbol, labelIndex?: number): Omit<LabelPlan, 'textMaxPt'> {
  const qz = QUIET_ZONE_MODULES.datamatrix;
  const side = Math.min(inner.height, inner.width * 0.45);
  const span = Math.max(symbol.widthModules, symbol.heightModules) + 2 * qz;
  const moduleMm = Math.min(snapDown(side / span, stock.dotMm), snapDown(MAX_DATAMATRIX_MODULE_MM, stock.dotMm));
  if (moduleMm < MIN_DATAMATRIX_MODULE_MM - 1e-9) throw tooLong(symbol, stock, labelIndex);
  const outerW = (symbol.widthModules + 2 * qz) * moduleMm;
  const outerH = (symbol.heightModules + 2 * qz) * moduleMm;
  const withQuietZone: RectMm = {
    x: inner.x,
    y: inner.y + (inner.height - outerH) / 2,
    width: outerW,
    height: outerH,
  };
  const symbolRect: RectMm = {
    x: withQuietZone.x + qz * moduleMm,
    y: withQuietZone.y + qz * moduleMm,
    width: symbol.widthModules * moduleMm,
    height: symbol.heightModules * moduleMm,
  };
  const textX = withQuietZone.x + outerW + GAP_MM;
  return {
    symbol: { symbology: 'datamatrix', symbol: symbolRect, withQuietZone, moduleMm, moduleHeightMm: moduleMm },
    headBox: { x: textX, y: inner.y, width: inner.x + inner.width - textX, height: inner.height },
  };
}

// Text block on top, bars below it, the code in mono under the bars; all centred.
function planLinearLabel(stock: Stock, inner: RectMm, symbol: EncodedSymbol, labelIndex?: number): Omit<LabelPlan, 'textMaxPt'> {
  const qz = QUIET_ZONE_MODULES.code128;
  const totalModules = symbol.widthModules + 2 * qz;
  const moduleMm = Math.min(snapDown(inner.width / totalModules, stock.dotMm), snapDown(MAX_CODE128_MODULE_MM, stock.dotMm));
  if (moduleMm < MIN_CODE128_MODULE_MM - 1e-9) throw tooLong(symbol, stock, labelIndex);
  const symbolWidth = symbol.widthModules * moduleMm;
  const minBar = Math.max(MIN_BAR_HEIGHT_MM, MIN_BAR_HEIGHT_RATIO * symbolWidth);
  const hriHeight = Math.max(2.2, inner.height * HRI_HEIGHT_RATIO);
  const barHeight = Math.max(minBar, Math.min(0.4 * inner.height, 15));
  if (barHeight + HRI_GAP_MM + hriHeight > inner.height) throw tooLong(symbol, stock, labelIndex);
  const hriBox: RectMm = { x: inner.x, y: inner.y + inner.height - hriHeight, width: inner.width, height: hriHeight };
  const symbolRect: RectMm = {
    x: inner.x + (inner.width - symbolWidth) / 2,
    y: hriBox.y - HRI_GAP_MM - barHeight,
    width: symbolWidth,
    height: barHeight,
  };
  const withQuietZone: RectMm = {
    x: symbolRect.x - qz * moduleMm,
    y: symbolRect.y,
    width: symbolWidth + 2 * qz * moduleMm,
    height: barHeight,
  };
  return {
    symbol: { symbology: 'code128', symbol: symbolRect, withQuietZone, moduleMm, moduleHeightMm: barHeight },
    headBox: { x: inner.x, y: inner.y, width: inner.width, height: Math.max(0, symbolRect.y - GAP_MM - inner.y) },
    hriBox,
  };
}

/** Measures text in a face; the PDF side supplies it from the embedded fonts. */
export interface TextMeasure {
  widthMm(text: string, face: Face, sizePt: number): number;
}

/** A fitted line: its text (possibly ending in "…"), size, and where its baseline starts. */
export interface PlacedLine {
  readonly text: string;
  readonly face: Face;
  readonly sizePt: number;
  readonly xMm: number;
  readonly baselineMm: number;
}

/** 1 pt = 1/72 in, 1 in = 25.4 mm. */
export const MM_PER_PT = 25.4 / 72;
const LINE_HEIGHT = 1.2;
// Ascent of Inter and JetBrains Mono is close to 0.95 em; placing the baseline there keeps
// capitals inside the line box without reading each font's metrics.
const ASCENT = 0.95;
/** Text smaller than this is no longer read comfortably on a label (common practice). */
export const MIN_TEXT_PT = 5;

/**
 * Fits lines into a box: the largest base size (at most `maxBasePt`) at which the lines stack
 * within the box height, dropping lines from the end (never a code) while any would be smaller
 * than MIN_TEXT_PT. Each line then shrinks to the box width, down to MIN_TEXT_PT, and below that
 * is cut with "…" (code lines keep shrinking instead).
 */
export function fitLines(
  lines: readonly TextLine[],
  box: RectMm,
  measure: TextMeasure,
  options: { maxBasePt: number; align: 'left' | 'center' },
): PlacedLine[] {
  if (lines.length === 0 || box.height <= 0 || box.width <= 0) return [];
  const kept = [...lines];
  const baseFor = (ls: readonly TextLine[]): number =>
    Math.min(options.maxBasePt, box.height / MM_PER_PT / ls.reduce((sum, l) => sum + l.scale * LINE_HEIGHT, 0));
  let base = baseFor(kept);
  // Fewer lines at a readable size beat all lines too small to read: drop from the end, codes last.
  while (kept.some((l) => base * l.scale < MIN_TEXT_PT)) {
    const dropAt = findLastIndex(kept, (l) => !l.keep);
    if (dropAt < 0 || kept.length === 1) break;
    kept.splice(dropAt, 1);
    base = baseFor(kept);
  }
  const sized = kept.map((l) => fitWidth(l, base * l.scale, box.width, measure));
  const blockHeight = sized.reduce((s, l) => s + l.sizePt * LINE_HEIGHT * MM_PER_PT, 0);
  let top = box.y + Math.max(0, (box.height - blockHeight) / 2);
  return sized.map((l) => {
    const lineHeightMm = l.sizePt * LINE_HEIGHT * MM_PER_PT;
    const width = measure.widthMm(l.text, l.face, l.sizePt);
    const xMm = options.align === 'center' ? box.x + (box.width - width) / 2 : box.x;
    const baselineMm = top + ((LINE_HEIGHT - 1) / 2 + ASCENT) * l.sizePt * MM_PER_PT;
    top += lineHeightMm;
    return { text: l.text, face: l.face, sizePt: l.sizePt, xMm, baselineMm };
  });
}

function findLastIndex<T>(items: readonly T[], test: (item: T) => boolean): number {
  for (let i = items.length - 1; i >= 0; i--) if (test(items[i] as T)) return i;
  return -1;
}

function fitWidth(
  l: TextLine,
  sizePt: number,
  widthMm: number,
  measure: TextMeasure,
): { text: string; face: Face; sizePt: number } {
  const w = measure.widthMm(l.text, l.face, sizePt);
  if (w <= widthMm) return { text: l.text, face: l.face, sizePt };
  const shrunk = (sizePt * widthMm) / w;
  if (l.keep || shrunk >= MIN_TEXT_PT) return { text: l.text, face: l.face, sizePt: shrunk * 0.999 };
  const size = Math.min(sizePt, MIN_TEXT_PT);
  let cut = l.text;
  while (cut.length > 0 && measure.widthMm(`${cut}…`, l.face, size) > widthMm) cut = [...cut].slice(0, -1).join('');
  return { text: cut.length > 0 ? `${cut.trimEnd()}…` : '', face: l.face, sizePt: size };
}
