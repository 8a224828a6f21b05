/**
 * The document a signed batch leaves behind: a disposal certificate, or a transfer form for
 * items returned to the customer. A4 pages with the app's own fonts embedded (labels/fonts.ts),
 * listing every item with its specimen, heat and order, and the signature: the signer's printed
 * name, the date and time, and the meaning.
 */
import { PDFDocument, type PDFFont } from 'pdf-lib';
import { EmbeddedFaces } from '../../labels/fonts';
import type { Face } from '../../labels/layouts';
import type { BatchKind } from '../../shared/schemas/disposals';
import { localDateTimeOf } from '../../shared/domain/retention';

/** One item line of a batch document. */
export interface DocumentItem {
  code: string;
  kind: 'specimen' | 'half';
  specimen: string | null;
  heat: string;
  order: string;
  customer: string;
  location: string;
  eventHash: string;
}

/** Everything a batch document shows. */
export interface BatchDocument {
  number: string;
  kind: BatchKind;
  signer: { name: string; email: string; role: string };
  meaning: string;
  statement: string;
  /** When the signature was given and when the batch was recorded (ISO 8601, UTC). */
  signedAt: string;
  recordedAt: string;
  /** The lab's time zone, to show local times beside UTC. */
  timeZone: string;
  order: string | null;
  customer: string | null;
  recipient: string | null;
  note: string | null;
  items: readonly DocumentItem[];
}

const PAGE_W = 595.28;
const PAGE_H = 841.89;
const MARGIN = 42;
const ROW = 13;
const BODY = 8.5;

/** A time in UTC and in the lab's zone, e.g. "2026-12-01 09:30:00 UTC (2026-12-01 10:30:00 Europe/Paris)". */
export function bothTimes(isoTime: string, timeZone: string): string {
  const date = new Date(isoTime);
  const utc = `${date.toISOString().slice(0, 19).replace('T', ' ')} UTC`;
  if (timeZone === 'UTC') return utc;
  const local = localDateTimeOf(date, timeZone);
  return `${utc} (${local} ${timeZone})`;
}

interface Column {
  title: string;
  width: number;
  face: Face;
  value: (item: DocumentItem, index: number) => string;
}

const COLUMNS: readonly Column[] = [
  { title: 'No.', width: 26, face: 'regular', value: (_i, n) => String(n + 1) },
  { title: 'Item', width: 92, face: 'mono', value: (i) => i.code },
  { title: 'Kind', width: 44, face: 'regular', value: (i) => i.kind },
  { title: 'Specimen', width: 84, face: 'mono', value: (i) => i.specimen ?? '—' },
  { title: 'Heat', width: 80, face: 'regular', value: (i) => i.heat },
  { title: 'Order', width: 80, face: 'regular', value: (i) => i.order },
  { title: 'Ledger event', width: 105, face: 'mono', value: (i) => `${i.eventHash.slice(0, 16)}…` },
];

/** Renders the certificate or transfer form as PDF bytes. */
export async function renderBatchDocument(doc: BatchDocument): Promise<Uint8Array> {
  const pdf = await PDFDocument.create();
  const title = doc.kind === 'disposal' ? 'Disposal certificate' : 'Transfer form: items returned to the customer';
  pdf.setTitle(`${title} ${doc.number}`);
  pdf.setCreator('Halfmark');
  pdf.setProducer('Halfmark');
  pdf.setCreationDate(new Date(doc.recordedAt));
  pdf.setModificationDate(new Date(doc.recordedAt));

  const header: [string, string][] = [
    ['Batch', doc.number],
    ['Items', String(doc.items.length)],
    ...(doc.customer ? ([['Customer', doc.customer]] as [string, string][]) : []),
    ...(doc.order ? ([['Order', doc.order]] as [string, string][]) : []),
    ...(doc.recipient ? ([['Received for the customer by', doc.recipient]] as [string, string][]) : []),
    ['Signed by', `${doc.signer.name} <${doc.signer.email}> (${doc.signer.role})`],
    ['Signed at', bothTimes(doc.signedAt, doc.timeZone)],
    ['Meaning of the signature', doc.meaning],
    ['Recorded at', bothTimes(doc.recordedAt, doc.timeZone)],
    ...(doc.note ? ([['Note', doc.note]] as [string, string][]) : []),
  ];
  const texts: [Face, string][] = [
    ['bold', title],
    ['regular', doc.statement],
    ...header.flatMap(([k, v]): [Face, string][] => [['bold', k], ['regular', v]]),
    ...doc.items.flatMap((item, n) => COLUMNS.map((c): [Face, string] => [c.face, c.value(item, n)])),
  ];
  const faces = await EmbeddedFaces.embed(pdf, texts);

  const pages: { content: string[]; keys: Map<PDFFont, string>; page: ReturnType<PDFDocument['addPage']> }[] = [];
  const newPage = () => {
    const page = pdf.addPage([PAGE_W, PAGE_H]);
    const entry = { content: [] as string[], keys: new Map<PDFFont, string>(), page };
    pages.push(entry);
    return entry;
  };
  let current = newPage();
  const fontKey = (font: PDFFont): string => {
    let key = current.keys.get(font);
    if (key === undefined) {
      key = current.page.node.newFontDictionary(font.name, font.ref).toString();
      current.keys.set(font, key);
    }
    return key;
  };
  const fit = (text: string, face: Face, size: number, width: number): string => {
    if (faces.widthPt(text, face, size) <= width) return text;
    let cut = text;
    while (cut.length > 1 && faces.widthPt(`${cut}…`, face, size) > width) cut = cut.slice(0, -1);
    return `${cut}…`;
  };
  const text = (value: string, face: Face, x: number, y: number, size: number, width = PAGE_W - MARGIN - x) => {
    current.content.push(faces.textContent(fit(value, face, size, width), face, x, y, size, fontKey));
  };
  const rule = (y: number) => current.content.push(`q 0.4 G 0.5 w ${MARGIN} ${y} m ${PAGE_W - MARGIN} ${y} l S Q\n`);
  // Long statements wrap at word boundaries to the text width.
  const wrap = (value: string, face: Face, size: number, width: number): string[] => {
    const lines: string[] = [];
    let line = '';
    for (const word of value.split(/\s+/)) {
      const next = line ? `${line} ${word}` : word;
      if (line && faces.widthPt(next, face, size) > width) {
        lines.push(line);
        line = word;
      } else line = next;
    }
    if (line) lines.push(line);
    return lines;
  };

  let y = PAGE_H - MARGIN - 14;
  text('Halfmark', 'bold', MARGIN, y, 10);
  y -= 22;
  text(title, 'bold', MARGIN, y, 16);
  y -= 20;
  for (const [label, value] of header) {
    text(label, 'bold', MARGIN, y, 9, 150);
    const lines = wrap(value, 'regular', 9, PAGE_W - 2 * MARGIN - 160);
    for (const [i, l] of lines.entries()) {
      text(l, 'regular', MARGIN + 160, y, 9);
      if (i < lines.length - 1) y -= 12;
    }
    y -= 14;
  }
  y -= 4;
  for (const l of wrap(`Statement signed: ${doc.statement}`, 'regular', 9, PAGE_W - 2 * MARGIN)) {
    text(l, 'regular', MARGIN, y, 9);
    y -= 12;
  }
  y -= 10;

  const tableHead = () => {
    let x = MARGIN;
    for (const c of COLUMNS) {
      text(c.title, 'bold', x, y, BODY, c.width - 4);
      x += c.width;
    }
    y -= 4;
    rule(y);
    y -= ROW - 2;
  };
  tableHead();
  for (const [n, item] of doc.items.entries()) {
    if (y < MARGIN + 60) {
      current = newPage();
      y = PAGE_H - MARGIN - 14;
      text(`${title} ${doc.number} (continued)`, 'bold', MARGIN, y, 10);
      y -= 22;
      tableHead();
    }
    let x = MARGIN;
    for (const c of COLUMNS) {
      text(c.value(item, n), c.face, x, y, BODY, c.width - 4);
      x += c.width;
    }
    y -= ROW;
  }
  rule(y + ROW - 4);
  y -= 8;
  if (y < MARGIN + 90) {
    current = newPage();
    y = PAGE_H - MARGIN - 14;
  }
  text(`End of list: ${doc.items.length} item${doc.items.length === 1 ? '' : 's'}.`, 'regular', MARGIN, y, 9);
  y -= 16;
  if (doc.kind === 'return') {
    text('Received by (name, signature, date):', 'regular', MARGIN, y, 9);
    y -= 36;
    current.content.push(`q 0 G 0.5 w ${MARGIN} ${y} m ${MARGIN + 300} ${y} l S Q\n`);
    y -= 16;
  }
  text('Every item above carries its own disposed or returned event in the custody ledger; the hash shown is that event’s.', 'regular', MARGIN, y, 8);

  for (const [i, entry] of pages.entries()) {
    current = entry;
    text(`${doc.number} · page ${i + 1} of ${pages.length}`, 'regular', MARGIN, MARGIN - 16, 8);
    entry.page.node.addContentStream(pdf.context.register(pdf.context.flateStream(entry.content.join(''))));
  }
  return pdf.save();
}
