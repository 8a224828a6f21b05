/**
 * Label PDFs: plain label data in, a finished PDF out, or a LabelError and no PDF at all.
 */
import { type PDFFont, PDFDocument, PrintScaling } from 'pdf-lib';
import { LabelError } from './errors';
import { EmbeddedFaces, cleanText } from './fonts';
import {
  type Face,
  LABEL_KINDS,
  type LabelDataByKind,
  type LabelKind,
  type LabelPlan,
  MM_PER_PT,
  SYMBOLOGY_BY_KIND,
  type TextMeasure,
  fitLines,
  labelText,
  planLabel,
} from './layouts';
import { type Stock, findStock, positionsPerPage } from './stocks';
import { type EncodedSymbol, encodeSymbol, symbolContent } from './symbols';

export { LabelError, type LabelErrorCode } from './errors';
export { listStocks, type Stock } from './stocks';

/** Most labels in one PDF: about 84 A4 sheets. Larger jobs are split by the caller. */
export const MAX_LABELS_PER_PDF = 2000;
/** Longest free-text field (heat, order, names, bag lines). */
export const MAX_FIELD_LENGTH = 120;
/** Most free lines on a bag label. */
export const MAX_BAG_LINES = 6;

/** A request for one PDF of labels of one kind on one stock. */
export type RenderRequest = {
  [K in LabelKind]: {
    kind: K;
    /** A stock key from listStocks(). */
    stock: string;
    labels: readonly LabelDataByKind[K][];
    /** 1-based position on the first sheet to start at (left to right, then down); default 1. */
    startPosition?: number;
  };
}[LabelKind];

/** Where one label sits on the output, in mm from the top-left corner of its page. */
export interface LabelRect {
  /** 0-based index of the label in the request. */
  readonly index: number;
  /** 0-based page number. */
  readonly page: number;
  /** 1-based position on its page, counted left to right, then down. */
  readonly position: number;
  readonly column: number;
  readonly row: number;
  readonly xMm: number;
  readonly yMm: number;
  readonly widthMm: number;
  readonly heightMm: number;
}

function requireStock(key: unknown): Stock {
  const stock = typeof key === 'string' ? findStock(key) : undefined;
  if (stock === undefined) {
    throw new LabelError('unknown-stock', `There is no label stock "${String(key)}". Choose one from the stock list.`);
  }
  return stock;
}

function checkCount(count: unknown): number {
  if (typeof count !== 'number' || !Number.isInteger(count) || count < 1) {
    throw new LabelError('no-labels', 'There are no labels to print: choose at least one item.');
  }
  if (count > MAX_LABELS_PER_PDF) {
    throw new LabelError(
      'too-many-labels',
      `${count} labels is more than the ${MAX_LABELS_PER_PDF} one PDF may hold; print them in smaller batches.`,
    );
  }
  return count;
}

function checkStart(stock: Stock, startPosition: unknown): number {
  const perPage = positionsPerPage(stock);
  if (startPosition === undefined) return 1;
  if (typeof startPosition !== 'number' || !Number.isInteger(startPosition) || startPosition < 1 || startPosition > perPage) {
    const where = perPage === 1 ? 'a roll has only position 1' : `this sheet has positions 1 to ${perPage}`;
    throw new LabelError('bad-start-position', `Start position ${String(startPosition)} is not on ${stock.name}: ${where}.`);
  }
  return startPosition;
}

/**
 * Where each of `count` labels goes on `stockKey`, starting at `startPosition` (1-based) on the
 * first page. Throws LabelError for an unknown stock, a bad count or a start position off the sheet.
 */
export function labelRects(stockKey: string, count: number, startPosition = 1): LabelRect[] {
  const stock = requireStock(stockKey);
  checkCount(count);
  const start = checkStart(stock, startPosition);
  const perPage = positionsPerPage(stock);
  const rects: LabelRect[] = [];
  for (let index = 0; index < count; index++) {
    const slot = start - 1 + index;
    const within = slot % perPage;
    const row = Math.floor(within / stock.columns);
    const column = within % stock.columns;
    rects.push({
      index,
      page: Math.floor(slot / perPage),
      position: within + 1,
      column,
      row,
      xMm: stock.marginLeftMm + column * (stock.labelWidthMm + stock.gapXMm),
      yMm: stock.marginTopMm + row * (stock.labelHeightMm + stock.gapYMm),
      widthMm: stock.labelWidthMm,
      heightMm: stock.labelHeightMm,
    });
  }
  return rects;
}

const REQUIRED_FIELDS: Readonly<Record<LabelKind, readonly string[]>> = {
  specimen: ['code', 'heat', 'order'],
  half: ['code', 'specimenCode', 'heat', 'order'],
  bag: ['code', 'title'],
  container: ['code', 'containerType', 'name'],
  badge: ['code', 'name', 'role'],
};

function invalid(index: number, what: string): LabelError {
  return new LabelError('invalid-label', `Label ${index + 1}: ${what}.`, index);
}

function checkText(index: number, field: string, value: unknown, required: boolean): void {
  if (value === undefined && !required) return;
  if (typeof value !== 'string') throw invalid(index, `${field} must be text`);
  if (required && value.trim() === '') throw invalid(index, `${field} is empty`);
  if (value.length > MAX_FIELD_LENGTH) throw invalid(index, `${field} is longer than ${MAX_FIELD_LENGTH} characters`);
}

// The server validates requests with its schemas; this guards callers that skip them, so bad
// data is refused here rather than drawn.
function checkLabel(kind: LabelKind, index: number, label: unknown): void {
  if (typeof label !== 'object' || label === null) throw invalid(index, 'no label data');
  const record = label as Record<string, unknown>;
  for (const field of REQUIRED_FIELDS[kind]) {
    if (field !== 'code') checkText(index, field, record[field], true);
  }
  if (kind === 'specimen') checkText(index, 'specimenLine', record.specimenLine, false);
  if (kind === 'bag') {
    const lines = record.lines;
    if (!Array.isArray(lines)) throw invalid(index, 'lines must be a list of text');
    if (lines.length > MAX_BAG_LINES) throw invalid(index, `a bag label holds at most ${MAX_BAG_LINES} lines`);
    lines.forEach((l, i) => checkText(index, `line ${i + 1}`, l, false));
  }
}

interface Prepared<K extends LabelKind> {
  readonly data: LabelDataByKind[K];
  readonly symbol: EncodedSymbol;
  readonly plan: LabelPlan;
}

/** 1 mm in points. */
const PT_PER_MM = 1 / MM_PER_PT;

/**
 * Renders labels of one kind on one stock as a PDF, with the app's fonts embedded and every
 * symbol drawn as vectors. All input is checked before the PDF is started: on any problem a
 * LabelError is thrown and nothing is returned.
 */
export async function renderLabelsPdf(request: RenderRequest): Promise<Uint8Array> {
  const kind: unknown = request.kind;
  if (typeof kind !== 'string' || !(LABEL_KINDS as readonly string[]).includes(kind)) {
    throw new LabelError('unknown-kind', `There is no label kind "${String(kind)}". Kinds: ${LABEL_KINDS.join(', ')}.`);
  }
  const stock = requireStock(request.stock);
  const labels: unknown = request.labels;
  if (!Array.isArray(labels)) throw new LabelError('no-labels', 'There are no labels to print: choose at least one item.');
  const rects = labelRects(stock.key, labels.length, checkStart(stock, request.startPosition));
  return renderChecked(request.kind, stock, request.labels, rects);
}

async function renderChecked<K extends LabelKind>(
  kind: K,
  stock: Stock,
  labels: readonly LabelDataByKind[K][],
  rects: readonly LabelRect[],
): Promise<Uint8Array> {
  const symbology = SYMBOLOGY_BY_KIND[kind];
  const prepared: Prepared<K>[] = labels.map((data, index) => {
    checkLabel(kind, index, data);
    const symbol = encodeSymbol(symbology, data.code, index);
    return { data, symbol, plan: planLabel(kind, stock, symbol, index) };
  });

  const doc = await PDFDocument.create();
  doc.setTitle(`Halfmark ${kind} labels`);
  doc.setCreator('Halfmark');
  doc.setProducer('Halfmark labels');
  // Sheets only line up when printed at 100 %: ask viewers not to fit the page to the paper.
  doc.catalog.getOrCreateViewerPreferences().setPrintScaling(PrintScaling.None);

  const texts = prepared.map((p) => labelText(kind, p.data));
  const faces = await EmbeddedFaces.embed(
    doc,
    texts.flatMap((t) => [...t.head, ...(t.hri ? [t.hri] : [])].map((l) => [l.face, l.text] as const)),
  );
  const measure: TextMeasure = {
    widthMm: (text: string, face: Face, sizePt: number) => faces.widthPt(text, face, sizePt) * MM_PER_PT,
  };

  const pageHeightPt = stock.pageHeightMm * PT_PER_MM;
  const align = symbology === 'datamatrix' ? 'left' : 'center';
  const pageCount = (rects[rects.length - 1]?.page ?? 0) + 1;
  for (let pageIndex = 0, i = 0; pageIndex < pageCount; pageIndex++) {
    const page = doc.addPage([stock.pageWidthMm * PT_PER_MM, pageHeightPt]);
    const fontKeys = new Map<PDFFont, string>();
    const fontKey = (font: PDFFont): string => {
      let key = fontKeys.get(font);
      if (key === undefined) {
        key = page.node.newFontDictionary(font.name, font.ref).toString();
        fontKeys.set(font, key);
      }
      return key;
    };
    // A page's symbols and text are written as content-stream text in one piece: building
    // pdf-lib operator objects for ~100,000 module rectangles per 1,000 labels is the slow way.
    const content: string[] = [];
    for (; i < prepared.length && (rects[i] as LabelRect).page === pageIndex; i++) {
      const p = prepared[i] as Prepared<K>;
      const rect = rects[i] as LabelRect;
      const text = texts[i] as (typeof texts)[number];
      const toX = (mm: number): number => (rect.xMm + mm) * PT_PER_MM;
      const toY = (mm: number): number => pageHeightPt - (rect.yMm + mm) * PT_PER_MM;
      const s = p.plan.symbol;
      content.push(
        symbolContent(p.symbol, {
          xPt: toX(s.symbol.x),
          topPt: toY(s.symbol.y),
          moduleWidthPt: s.moduleMm * PT_PER_MM,
          moduleHeightPt: s.moduleHeightMm * PT_PER_MM,
        }),
      );
      const placed = fitLines(text.head, p.plan.headBox, measure, { maxBasePt: p.plan.textMaxPt, align });
      if (text.hri !== undefined && p.plan.hriBox !== undefined) {
        placed.push(...fitLines([text.hri], p.plan.hriBox, measure, { maxBasePt: p.plan.textMaxPt, align: 'center' }));
      }
      for (const l of placed) {
        content.push(faces.textContent(cleanText(l.text), l.face, toX(l.xMm), toY(l.baselineMm), l.sizePt, fontKey));
      }
    }
    page.node.addContentStream(doc.context.register(doc.context.flateStream(content.join(''))));
  }
  return doc.save();
}
