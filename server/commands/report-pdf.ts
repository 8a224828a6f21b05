/**
 * The test report as a PDF: A4 pages, the report number and "Page x of y" on every page, the
 * order, each specimen with its heat, dimensions, S0, results and verdict, the statement that
 * results relate only to the items tested (ISO/IEC 17025 7.8.2.1), and the electronic signature
 * with the signer's printed name, date and time, and meaning (21 CFR 11.50). Fonts are the app's
 * own (labels/fonts.ts), embedded as subsets.
 */
import { PDFDocument, type PDFFont } from 'pdf-lib';
import { EmbeddedFaces } from '../../labels/fonts';
import type { Face } from '../../labels/layouts';

/** What a report says about one specimen. */
export interface ReportSpecimen {
  code: string;
  heatNumber: string;
  sampleCode: string;
  geometry: string;
  dimensions: string;
  s0: string;
  l0: string;
  /** One line per result: symbol, value or the reason it was not determined. */
  results: { symbol: string; name: string; value: string }[];
  verdict: string;
  verdictLines: string[];
  warnings: string[];
}

/** Everything printed on a report. */
export interface ReportDocument {
  number: string;
  issuedAt: string;
  order: { number: string; customerName: string; poReference: string; materialSpec: string; testStandard: string };
  specification: string;
  overallVerdict: string;
  supersedes: string | null;
  reason: string | null;
  signature: { name: string; email: string; meaning: string; statement: string; signedAt: string };
  specimens: ReportSpecimen[];
}

/** The statement every report carries. */
export const ITEMS_TESTED_STATEMENT = 'The results in this report relate only to the items tested.';

const PAGE_W = 595.28;
const PAGE_H = 841.89;
const MARGIN = 50;
const BODY_TOP = PAGE_H - 92;
const BODY_BOTTOM = 78;

type Op = { kind: 'text'; face: Face; size: number; x: number; y: number; text: string } | { kind: 'rule'; y: number; weight: number };

/** "2026-12-01 14:03 UTC" from an ISO time: one unambiguous form on paper. */
export function printedTime(iso: string): string {
  return `${iso.slice(0, 10)} ${iso.slice(11, 16)} UTC`;
}

class Layout {
  pages: Op[][] = [[]];
  y = BODY_TOP;
  constructor(private readonly faces: EmbeddedFaces) {}

  private get page(): Op[] {
    return this.pages[this.pages.length - 1] as Op[];
  }

  newPage(): void {
    this.pages.push([]);
    this.y = BODY_TOP;
  }

  /** Starts a new page unless `height` points fit above the bottom margin. */
  need(height: number): void {
    if (this.y - height < BODY_BOTTOM) this.newPage();
  }

  wrap(text: string, face: Face, size: number, width: number): string[] {
    const lines: string[] = [];
    let line = '';
    for (const word of text.split(/\s+/).filter(Boolean)) {
      const next = line === '' ? word : `${line} ${word}`;
      if (line !== '' && this.faces.widthPt(next, face, size) > width) {
        lines.push(line);
        line = word;
      } else line = next;
    }
    if (line !== '') lines.push(line);
    return lines.length > 0 ? lines : [''];
  }

  /** Writes wrapped text at x, moving down; breaks the page between lines. */
  text(text: string, opts: { face?: Face; size?: number; x?: number; width?: number; gap?: number } = {}): void {
    const face = opts.face ?? 'regular';
    const size = opts.size ?? 9.5;
    const x = opts.x ?? MARGIN;
    const lead = size * 1.35;
    for (const line of this.wrap(text, face, size, opts.width ?? PAGE_W - MARGIN - x)) {
      this.need(lead);
      this.y -= lead;
      this.page.push({ kind: 'text', face, size, x, y: this.y, text: line });
    }
    this.y -= opts.gap ?? 0;
  }

  /** A label and a value on one line (the value wrapped in its column). */
  pair(label: string, value: string, opts: { x?: number; labelWidth?: number; valueFace?: Face } = {}): void {
    const x = opts.x ?? MARGIN;
    const labelWidth = opts.labelWidth ?? 120;
    const size = 9.5;
    const lead = size * 1.35;
    const lines = this.wrap(value, opts.valueFace ?? 'regular', size, PAGE_W - MARGIN - x - labelWidth);
    this.need(lead * Math.min(lines.length, 3));
    lines.forEach((line, i) => {
      this.need(lead);
      this.y -= lead;
      if (i === 0) this.page.push({ kind: 'text', face: 'bold', size, x, y: this.y, text: label });
      this.page.push({ kind: 'text', face: opts.valueFace ?? 'regular', size, x: x + labelWidth, y: this.y, text: line });
    });
  }

  rule(weight = 0.5, space = 6): void {
    this.need(space * 2);
    this.y -= space;
    this.page.push({ kind: 'rule', y: this.y, weight });
    this.y -= space;
  }
}

function allTexts(doc: ReportDocument): [Face, string][] {
  const texts: string[] = [
    doc.order.customerName,
    doc.order.poReference,
    doc.order.materialSpec,
    doc.order.testStandard,
    doc.specification,
    doc.overallVerdict,
    doc.reason ?? '',
    doc.signature.name,
    doc.signature.email,
    doc.signature.statement,
    ...doc.specimens.flatMap((s) => [s.heatNumber, s.sampleCode, s.geometry, s.dimensions, s.verdict, ...s.verdictLines, ...s.warnings, ...s.results.map((r) => `${r.name} ${r.value}`)]),
  ];
  return (['regular', 'bold', 'mono'] as const).flatMap((face) => texts.map((t) => [face, t] as [Face, string]));
}

/**
 * Renders a test report.
 *
 * @param doc - What the report says.
 * @returns The PDF's bytes.
 */
export async function renderReportPdf(doc: ReportDocument): Promise<Uint8Array> {
  const pdf = await PDFDocument.create();
  pdf.setTitle(`Test report ${doc.number}`);
  pdf.setCreator('Halfmark');
  pdf.setProducer('Halfmark reports');
  pdf.setCreationDate(new Date(doc.issuedAt));
  pdf.setModificationDate(new Date(doc.issuedAt));
  const faces = await EmbeddedFaces.embed(pdf, allTexts(doc));
  const l = new Layout(faces);

  l.text('Tensile test report', { face: 'bold', size: 16, gap: 4 });
  l.pair('Report number', doc.number, { valueFace: 'mono' });
  l.pair('Issued', printedTime(doc.issuedAt));
  if (doc.supersedes) l.pair('Supersedes', `${doc.supersedes}${doc.reason ? ` (reason: ${doc.reason})` : ''}`);
  l.pair('Order', doc.order.number, { valueFace: 'mono' });
  l.pair('Customer', doc.order.customerName);
  l.pair('Purchase order', doc.order.poReference);
  l.pair('Material specification', doc.order.materialSpec);
  l.pair('Judged against', doc.specification);
  l.pair('Test method', doc.order.testStandard);
  l.pair('Overall verdict', doc.overallVerdict);
  l.rule(1, 8);

  for (const s of doc.specimens) {
    l.need(150);
    l.text(`Specimen ${s.code}`, { face: 'bold', size: 11.5, gap: 2 });
    l.pair('Heat', s.heatNumber, { valueFace: 'mono' });
    l.pair('Sample', s.sampleCode, { valueFace: 'mono' });
    l.pair('Geometry', s.geometry);
    l.pair('Dimensions', s.dimensions);
    l.pair('S0', s.s0);
    l.pair('L0', s.l0);
    for (const r of s.results) l.pair(`${r.symbol}`, `${r.value}`, { x: MARGIN, labelWidth: 120 });
    l.pair('Verdict', s.verdict);
    for (const v of s.verdictLines) l.text(`· ${v}`, { x: MARGIN + 120, size: 8.5 });
    for (const w of s.warnings) l.text(`Note: ${w}`, { x: MARGIN + 120, size: 8.5 });
    l.rule(0.5, 7);
  }

  l.need(110);
  l.text(ITEMS_TESTED_STATEMENT, { face: 'bold', size: 10, gap: 8 });
  l.text('Electronic signature', { face: 'bold', size: 11, gap: 2 });
  l.pair('Signed by', `${doc.signature.name} (${doc.signature.email})`);
  l.pair('Date and time', printedTime(doc.signature.signedAt));
  l.pair('Meaning', `${doc.signature.meaning}: ${doc.signature.statement}`);

  const total = l.pages.length;
  l.pages.forEach((ops, index) => {
    const page = pdf.addPage([PAGE_W, PAGE_H]);
    const keys = new Map<PDFFont, string>();
    const fontKey = (font: PDFFont): string => {
      let key = keys.get(font);
      if (key === undefined) {
        key = page.node.newFontDictionary(font.name, font.ref).toString();
        keys.set(font, key);
      }
      return key;
    };
    const content: string[] = [];
    const head: Op[] = [
      { kind: 'text', face: 'bold', size: 10, x: MARGIN, y: PAGE_H - 50, text: 'Halfmark · tensile test report' },
      { kind: 'rule', y: PAGE_H - 60, weight: 0.75 },
      { kind: 'rule', y: 62, weight: 0.5 },
      { kind: 'text', face: 'regular', size: 8, x: MARGIN, y: 50, text: ITEMS_TESTED_STATEMENT },
    ];
    const numberText = `Report ${doc.number}`;
    head.push({ kind: 'text', face: 'mono', size: 10, x: PAGE_W - MARGIN - faces.widthPt(numberText, 'mono', 10), y: PAGE_H - 50, text: numberText });
    const pageText = `Page ${index + 1} of ${total}`;
    head.push({ kind: 'text', face: 'regular', size: 8, x: PAGE_W - MARGIN - faces.widthPt(pageText, 'regular', 8), y: 50, text: pageText });
    for (const op of [...head, ...ops]) {
      if (op.kind === 'rule') content.push(`q ${op.weight} w 0 G ${MARGIN} ${op.y.toFixed(2)} m ${PAGE_W - MARGIN} ${op.y.toFixed(2)} l S Q\n`);
      else content.push(faces.textContent(op.text, op.face, op.x, op.y, op.size, fontKey));
    }
    page.node.addContentStream(pdf.context.register(pdf.context.flateStream(content.join(''))));
  });
  return pdf.save({ useObjectStreams: false });
}
