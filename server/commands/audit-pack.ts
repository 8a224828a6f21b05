/**
 * The audit pack of one item and everything under it: a machine-readable JSON Lines export of
 * every event with its hashes and the seals that cover them (docs/ledger-format.md §5), and a
 * PDF report for people (genealogy, chain status, files, anomalies, readings, timeline).
 */
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import fontkit from '@pdf-lib/fontkit';
import { PDFDocument, rgb, type PDFFont, type PDFPage } from 'pdf-lib';
import { auditEventLine, auditHeaderLine, auditSealLine } from '../../shared/domain/ledger/audit-jsonl';
import { GENESIS_HASH } from '../../shared/domain/ledger/event-hash';
import { ATTACHMENT_CATEGORY_LABELS, describeBytes } from '../../shared/schemas/attachments';
import type { TraceView } from '../../shared/schemas/trace';
import type { AppContext } from '../app';
import { loadSeals } from './seal-day';
import { buildTrace, loadEvents, resolveItem, traceScope } from './trace';

/** The JSON Lines export and what it holds. */
export interface AuditJsonl {
  text: string;
  items: string[];
  events: number;
  seals: number;
}

/**
 * The audit export of an item: its chain and those of everything under it (a specimen's halves,
 * a half's specimen, a container's contents), each item's events in seq order, then every daily
 * seal from the day of the first of those events on. The header lists the items and the
 * prevSeal the first seal line must carry.
 */
export async function buildAuditJsonl(ctx: AppContext, code: string, now = new Date()): Promise<AuditJsonl> {
  const row = await resolveItem(ctx.sequelize, code);
  const scope = await traceScope(ctx.sequelize, row, { contents: true });
  const events = await loadEvents(ctx.sequelize, scope);
  const all = [...events.values()].flat();
  const firstDay = all.reduce((min, e) => (e.recordedAt < min ? e.recordedAt : min), '9999').slice(0, 10);
  const seals = (await loadSeals(ctx.sequelize)).filter((s) => s.day >= firstDay);
  const lines = [
    auditHeaderLine({
      exportedAt: now.toISOString(),
      items: scope.map((s) => s.code),
      firstPrevSeal: seals[0]?.seal.prevSeal ?? GENESIS_HASH,
    }),
    ...all.map((e) => auditEventLine(e)),
    ...seals.map((s) => auditSealLine(s.seal)),
  ];
  return { text: `${lines.join('\n')}\n`, items: scope.map((s) => s.code), events: all.length, seals: seals.length };
}

// ---------------------------------------------------------------------------------------------
// PDF

const require = createRequire(import.meta.url);

type Face = 'regular' | 'bold' | 'mono';

const FONT_FILES: Record<Face, { pkg: string; file: string }> = {
  regular: { pkg: '@fontsource/inter', file: 'inter-latin-400-normal.woff' },
  bold: { pkg: '@fontsource/inter', file: 'inter-latin-600-normal.woff' },
  mono: { pkg: '@fontsource/jetbrains-mono', file: 'jetbrains-mono-latin-400-normal.woff' },
};

let fontBytes: Promise<Record<Face, { bytes: Uint8Array; chars: Set<number> }>> | undefined;

function loadFonts() {
  fontBytes ??= (async () => {
    const out = {} as Record<Face, { bytes: Uint8Array; chars: Set<number> }>;
    for (const face of Object.keys(FONT_FILES) as Face[]) {
      const { pkg, file } = FONT_FILES[face];
      // The packages export only CSS; their root entry resolves to index.css beside files/.
      const bytes = new Uint8Array(await readFile(join(dirname(require.resolve(pkg)), 'files', file)));
      out[face] = { bytes, chars: new Set(fontkit.create(bytes).characterSet) };
    }
    return out;
  })();
  return fontBytes;
}

const A4 = { width: 595.28, height: 841.89 };
const MARGIN = 48;
const INK = rgb(0.1, 0.1, 0.12);
const MUTED = rgb(0.38, 0.38, 0.42);
const RULE = rgb(0.82, 0.82, 0.85);
const GOOD = rgb(0.1, 0.45, 0.2);
const STOP = rgb(0.7, 0.1, 0.1);

/** Lays out text down pages, adding a page when one is full. */
class Writer {
  page!: PDFPage;
  y = 0;
  private constructor(
    readonly doc: PDFDocument,
    private readonly fonts: Record<Face, PDFFont>,
    private readonly chars: Record<Face, Set<number>>,
  ) {}

  static async create(): Promise<Writer> {
    const doc = await PDFDocument.create();
    doc.registerFontkit(fontkit);
    const data = await loadFonts();
    const fonts = {} as Record<Face, PDFFont>;
    const chars = {} as Record<Face, Set<number>>;
    for (const face of Object.keys(data) as Face[]) {
      fonts[face] = await doc.embedFont(data[face].bytes, { subset: true });
      chars[face] = data[face].chars;
    }
    const writer = new Writer(doc, fonts, chars);
    writer.newPage();
    return writer;
  }

  newPage(): void {
    this.page = this.doc.addPage([A4.width, A4.height]);
    this.y = A4.height - MARGIN;
  }

  /** Text the font can draw: control characters become spaces, anything uncovered "?". */
  clean(text: string, face: Face): string {
    let out = '';
    for (const ch of text.replace(/[\u0000-\u001f\u007f-\u009f]/g, ' ')) out += this.chars[face].has(ch.codePointAt(0) ?? 0) ? ch : '?';
    return out;
  }

  width(text: string, face: Face, size: number): number {
    return this.fonts[face].widthOfTextAtSize(text, size);
  }

  /** Splits text into lines no wider than `maxWidth`, breaking long words (hashes, JSON) anywhere. */
  wrap(text: string, face: Face, size: number, maxWidth: number): string[] {
    const lines: string[] = [];
    for (const paragraph of this.clean(text, face).split('\n')) {
      let line = '';
      for (const word of paragraph.split(/(?<= )/)) {
        if (this.width(line + word, face, size) <= maxWidth) {
          line += word;
          continue;
        }
        if (line !== '') lines.push(line.trimEnd());
        line = '';
        let rest = word;
        while (this.width(rest, face, size) > maxWidth) {
          let cut = rest.length - 1;
          while (cut > 1 && this.width(rest.slice(0, cut), face, size) > maxWidth) cut--;
          lines.push(rest.slice(0, cut));
          rest = rest.slice(cut);
        }
        line = rest;
      }
      lines.push(line.trimEnd());
    }
    return lines;
  }

  ensure(height: number): void {
    if (this.y - height < MARGIN + 24) this.newPage();
  }

  text(text: string, opts: { face?: Face; size?: number; x?: number; width?: number; color?: ReturnType<typeof rgb>; gap?: number } = {}): void {
    const face = opts.face ?? 'regular';
    const size = opts.size ?? 9;
    const x = opts.x ?? MARGIN;
    const width = opts.width ?? A4.width - MARGIN - x;
    const lead = size * 1.35;
    for (const line of this.wrap(text, face, size, width)) {
      this.ensure(lead);
      this.y -= lead;
      this.page.drawText(line, { x, y: this.y + size * 0.25, size, font: this.fonts[face], color: opts.color ?? INK });
    }
    this.y -= opts.gap ?? 0;
  }

  /** A label in the left column and its value beside it. */
  pair(label: string, value: string, face: Face = 'regular'): void {
    const size = 9;
    const labelWidth = 118;
    const lines = this.wrap(value, face, size, A4.width - 2 * MARGIN - labelWidth);
    const lead = size * 1.35;
    this.ensure(lead * lines.length);
    this.page.drawText(this.clean(label, 'bold'), { x: MARGIN, y: this.y - lead + size * 0.25, size, font: this.fonts.bold, color: MUTED });
    for (const line of lines) {
      this.y -= lead;
      this.page.drawText(line, { x: MARGIN + labelWidth, y: this.y + size * 0.25, size, font: this.fonts[face], color: INK });
    }
  }

  heading(text: string): void {
    this.ensure(40);
    this.y -= 14;
    this.text(text, { face: 'bold', size: 12.5 });
    this.page.drawLine({ start: { x: MARGIN, y: this.y - 3 }, end: { x: A4.width - MARGIN, y: this.y - 3 }, thickness: 0.6, color: RULE });
    this.y -= 8;
  }

  /** A status line: a filled circle for good, a triangle for a problem, and the words. */
  status(ok: boolean, words: string): void {
    const size = 10.5;
    this.ensure(size * 1.6);
    this.y -= size * 1.5;
    const cy = this.y + size * 0.6;
    if (ok) this.page.drawCircle({ x: MARGIN + 5, y: cy, size: 4.5, color: GOOD });
    else this.page.drawSvgPath('M 0 -5 L 5.5 4.5 L -5.5 4.5 Z', { x: MARGIN + 5.5, y: cy, color: STOP });
    this.page.drawText(this.clean(words, 'bold'), { x: MARGIN + 16, y: this.y + size * 0.25, size, font: this.fonts.bold, color: ok ? GOOD : STOP });
  }

  /** "page x of y" and the item on every page, once all pages exist. */
  footers(code: string, verifiedAt: string): void {
    const pages = this.doc.getPages();
    pages.forEach((page, i) => {
      const left = this.clean(`Halfmark audit pack · ${code} · verified ${verifiedAt}`, 'regular');
      const right = `page ${i + 1} of ${pages.length}`;
      page.drawLine({ start: { x: MARGIN, y: MARGIN - 4 }, end: { x: A4.width - MARGIN, y: MARGIN - 4 }, thickness: 0.5, color: RULE });
      page.drawText(left, { x: MARGIN, y: MARGIN - 16, size: 7.5, font: this.fonts.regular, color: MUTED });
      page.drawText(right, { x: A4.width - MARGIN - this.width(right, 'regular', 7.5), y: MARGIN - 16, size: 7.5, font: this.fonts.regular, color: MUTED });
    });
  }
}

/** A payload as "key: value" lines, nested members with dotted names, lists joined. */
export function payloadLines(payload: Record<string, unknown>, prefix = ''): string[] {
  const lines: string[] = [];
  for (const [key, value] of Object.entries(payload)) {
    const name = prefix ? `${prefix}.${key}` : key;
    if (Array.isArray(value) && value.every((v) => typeof v !== 'object' || v === null)) lines.push(`${name}: ${value.join(', ')}`);
    else if (typeof value === 'object' && value !== null && !Array.isArray(value)) lines.push(...payloadLines(value as Record<string, unknown>, name));
    else lines.push(`${name}: ${typeof value === 'string' ? value : JSON.stringify(value)}`);
  }
  return lines;
}

function when(iso: string): string {
  return iso.replace('T', ' ').replace(/\.\d{3}Z$/, ' UTC').replace(/Z$/, ' UTC');
}

/**
 * The audit report of an item as a PDF (A4): what it is and where it is, its genealogy, the
 * verification of every chain and stored file with the date it was done, the anomalies, the
 * readings and results, and the full timeline with each event's hash; the embedded fonts are
 * the app's own (subset); every page says "page x of y".
 */
export async function buildAuditPdf(ctx: AppContext, code: string): Promise<{ bytes: Uint8Array; trace: TraceView; jsonl: AuditJsonl }> {
  const trace = await buildTrace(ctx, code, { files: 'rehash', canExport: true });
  const jsonl = await buildAuditJsonl(ctx, code, new Date(trace.verifiedAt));
  const w = await Writer.create();
  const g = trace.genealogy;
  w.doc.setTitle(`Audit pack ${trace.item.code}`);
  w.doc.setSubject('Chain of custody: genealogy, verification, anomalies, readings and timeline');
  w.doc.setProducer('Halfmark');
  w.doc.setCreationDate(new Date(trace.verifiedAt));

  w.text('Audit pack', { face: 'bold', size: 20, gap: 2 });
  w.text(trace.item.code, { face: 'mono', size: 15, gap: 2 });
  w.text(`${trace.item.kind}, ${trace.item.stateLabel}. Verified on ${when(trace.verifiedAt)}.`, { color: MUTED, gap: 6 });

  w.heading('Verification');
  const brokenChains = trace.chains.filter((c) => !c.ok);
  w.status(trace.chainOk, trace.chainOk ? `Chains intact: ${trace.chains.length} of ${trace.chains.length}` : `Chain broken: ${brokenChains.map((c) => c.item).join(', ')}`);
  for (const c of brokenChains) w.text(c.firstBreak?.message ?? 'The chain does not verify.', { x: MARGIN + 16, color: STOP });
  const badFiles = trace.files.checks.filter((c) => !c.ok);
  w.status(trace.files.ok, trace.files.checks.length === 0 ? 'No files attached' : trace.files.ok ? `Files re-hashed: ${trace.files.checks.length} match` : `Files: ${badFiles.length} do not match`);
  for (const c of badFiles) w.text(c.message, { x: MARGIN + 16, color: STOP });
  w.y -= 4;
  w.pair('Date of verification', when(trace.verifiedAt));
  w.pair('Events in this pack', `${jsonl.events} events on ${jsonl.items.length} item(s); ${jsonl.seals} daily seal(s) cover them`);
  for (const c of trace.chains) w.pair(`Head of ${c.item}`, `seq ${c.headSeq} · ${c.headHash ?? '—'}`, 'mono');
  w.text(
    'The machine-readable export (audit.jsonl) holds every event with its hash and the seals; run tools/verify-audit-pack.mjs on it to check the chains without the application.',
    { color: MUTED, size: 8, gap: 2 },
  );

  w.heading('Genealogy');
  w.pair('Customer', g.customer?.name ?? '—');
  w.pair('Order', g.order ? `${g.order.number} · PO ${g.order.poReference} · ${g.order.materialSpec} · ${g.order.testStandard}` : '—');
  w.pair('Heat', g.heat ? `${g.heat.heatNumber} · ${g.heat.material} ${g.heat.grade} · ${g.heat.producer}${g.heat.certificateRef ? ` · certificate ${g.heat.certificateRef}` : ''}` : '—');
  w.pair('Sample', g.sample ? `${g.sample.code} · ${g.sample.position}, ${g.sample.orientation}${g.sample.thicknessMm ? ` · ${g.sample.thicknessMm} mm` : ''}` : '—');
  w.pair('Specimen', g.specimen ? `${g.specimen.code} · ${g.specimen.state} · ${g.specimen.geometryKey} · ${g.specimen.testStandard}` : '—');
  w.pair('Halves', g.halves.length ? g.halves.map((h) => `${h.code} (${h.side}, ${h.state})`).join('; ') : '—');
  w.pair('Where it is now', trace.location.text);
  if (g.contents.length) w.pair('Contents now', g.contents.map((c) => c.code).join(', '));

  w.heading('Anomalies');
  if (trace.anomalies.length === 0) w.status(true, 'None found');
  for (const a of trace.anomalies) {
    w.text(`${a.severity.toUpperCase()} · ${a.code.replace(/_/g, ' ')} · ${a.item}${a.eventSeq ? ` seq ${a.eventSeq}` : ''}`, { face: 'bold', size: 9 });
    w.text(a.message, { x: MARGIN + 10, gap: 3 });
  }

  w.heading('Readings and results');
  const readings = trace.events.filter((e) => e.type === 'measured' || e.type === 'tested');
  if (readings.length === 0) w.text('No measurements or test results are recorded.', { color: MUTED });
  for (const e of readings) {
    w.text(`${e.item} seq ${e.seq} · ${e.type}${e.cancelled ? ' (voided)' : ''} · ${when(e.occurredAt)} · ${e.actor.name}`, { face: 'bold' });
    for (const line of payloadLines(e.payload)) w.text(line, { face: 'mono', size: 8, x: MARGIN + 10 });
    w.y -= 3;
  }

  w.heading('Attachments');
  if (trace.attachments.length === 0) w.text('No files are attached.', { color: MUTED });
  for (const a of trace.attachments) {
    w.text(`${ATTACHMENT_CATEGORY_LABELS[a.category]} · ${a.fileName} · ${a.type} · ${describeBytes(a.size)} · ${a.item} seq ${a.seq}`);
    w.text(a.sha256, { face: 'mono', size: 7.5, x: MARGIN + 10, gap: 2 });
  }

  w.heading('Timeline');
  for (const e of trace.events) {
    w.ensure(60);
    w.text(`${e.item} · seq ${e.seq} · ${e.type.replace(/_/g, ' ')}${e.cancelled ? ' · VOIDED by a later event' : ''}`, { face: 'bold', size: 9.5 });
    w.pair('Device time', when(e.occurredAt));
    w.pair('Server time', when(e.recordedAt));
    w.pair('Who', `${e.actor.name}${e.actor.role ? ` (${e.actor.role})` : ''}`);
    w.pair('Where', [e.station ? `${e.stationName ?? e.station} (${e.station})` : null, e.container ? `in ${e.container}` : null].filter(Boolean).join(', ') || '—');
    if (e.signature) w.pair('Signed', `${e.signature.signerName}, ${when(e.signature.signedAt)}: ${e.signature.meaning}`);
    if (e.corrects) w.pair('Cancels', e.corrects, 'mono');
    const lines = payloadLines(e.payload);
    if (lines.length) w.pair('Payload', lines.join('\n'), 'mono');
    w.pair('Hash', e.hash, 'mono');
    w.y -= 6;
  }

  w.footers(trace.item.code, when(trace.verifiedAt));
  return { bytes: await w.doc.save(), trace, jsonl };
}
