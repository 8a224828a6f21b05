import { execFile } from 'node:child_process';
import { mkdtemp, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import { PDFDocument } from 'pdf-lib';
import { describe, expect, it } from 'vitest';
import { crop, darkBox, decodeWithZxingJs, decodeWithZxingWasm, rasterise } from './decode-for-tests';
import { LABEL_KINDS, type LabelDataByKind, type LabelKind, SYMBOLOGY_BY_KIND, planLabel } from './layouts';
import { LabelError, MAX_LABELS_PER_PDF, type RenderRequest, labelRects, listStocks, renderLabelsPdf } from './render';
import { type Stock, findStock, positionsPerPage } from './stocks';
import { encodeSymbol } from './symbols';

const run = promisify(execFile);

// Invented example data. Codes follow Halfmark's formats; the check characters are arbitrary
// (rendering does not validate them), and some end in "*", which the code alphabet allows.
const SAMPLES: { [K in LabelKind]: LabelDataByKind[K][] } = {
  specimen: [
    { code: 'S26-00157-K', heat: 'H24-7731', order: 'PO-2026-0042', specimenLine: 'Flat 12.5 mm · tensile' },
    { code: 'S26-00158-*', heat: 'H24-7731', order: 'PO-2026-0042' },
    { code: 'S26-00159-3', heat: 'L-0915', order: 'PO-2026-0043', specimenLine: 'Round 6 mm' },
    { code: 'S26-01200-Q', heat: 'H25-0002', order: 'PO-2026-0107' },
  ],
  half: [
    { code: 'S26-00157B-7', specimenCode: 'S26-00157-K', heat: 'H24-7731', order: 'PO-2026-0042' },
    { code: 'S26-00158B-*', specimenCode: 'S26-00158-*', heat: 'H24-7731', order: 'PO-2026-0042' },
    { code: 'S26-00159B-M', specimenCode: 'S26-00159-3', heat: 'L-0915', order: 'PO-2026-0043' },
    { code: 'S26-01200B-0', specimenCode: 'S26-01200-Q', heat: 'H25-0002', order: 'PO-2026-0107' },
  ],
  bag: [
    { code: 'C-00042-*', title: 'Retained halves', lines: ['Order PO-2026-0042', 'Keep until 2027-03-31'] },
    { code: 'C-00043-M', title: 'Halves, heat H24-7731', lines: ['Specimens S26-00157 to S26-00164'] },
    { code: 'C-00044-2', title: 'Returned to customer', lines: [] },
    { code: 'C-00045-Z', title: 'Rejects before test', lines: ['Order PO-2026-0043', 'Box 3', 'Shelf B'] },
  ],
  container: [
    { code: 'C-00001-8', containerType: 'Box', name: 'Retained 2026-Q1' },
    { code: 'C-00002-*', containerType: 'Shelf', name: 'Store B / 4' },
    { code: 'C-00003-K', containerType: 'Bin', name: 'Cell 2, half A' },
    { code: 'C-00004-5', containerType: 'Cart', name: 'Machine shop' },
  ],
  badge: [
    { code: 'U-7KQ4M2-X', name: 'Ada Fenwick', role: 'Technician' },
    { code: 'U-3HT9PW-*', name: 'Łucja Wróbel-Marsh', role: 'Retained-sample clerk' },
    { code: 'U-A1B2C3-4', name: 'Tomás Okafor', role: 'Machinist' },
    { code: 'U-ZZ99QQ-R', name: 'Mira Lindqvist', role: 'Lab manager' },
  ],
};

function request<K extends LabelKind>(kind: K, stock: Stock): RenderRequest {
  // Rolls: three labels, one per page. Sheets: start on the second-last position so the labels
  // run over onto a second sheet, which exercises the start position and the page break.
  const perPage = positionsPerPage(stock);
  const labels = stock.kind === 'roll' ? SAMPLES[kind].slice(0, 3) : SAMPLES[kind];
  const startPosition = stock.kind === 'roll' ? 1 : perPage - 1;
  return { kind, stock: stock.key, labels, startPosition } as RenderRequest;
}

describe('renderLabelsPdf round trip: rasterised at 300 dpi and decoded by two independent decoders', () => {
  const cases = LABEL_KINDS.flatMap((kind) => listStocks().map((stock) => [kind, stock.key, stock] as const));

  it.each(cases)('%s labels on %s', async (kind, _key, stock) => {
    const req = request(kind, stock);
    const pdf = await renderLabelsPdf(req);
    const rects = labelRects(stock.key, req.labels.length, req.startPosition);
    const pageCount = Math.max(...rects.map((r) => r.page)) + 1;

    const doc = await PDFDocument.load(pdf);
    expect(doc.getPageCount()).toBe(pageCount);
    for (const page of doc.getPages()) {
      // Page size in points (1 pt = 1/72 in, 1 in = 25.4 mm): within 0.5 mm of the stock's page.
      expect(Math.abs((page.getWidth() * 25.4) / 72 - stock.pageWidthMm)).toBeLessThan(0.5);
      expect(Math.abs((page.getHeight() * 25.4) / 72 - stock.pageHeightMm)).toBeLessThan(0.5);
    }

    const pages = await rasterise(pdf, pageCount);
    const symbology = SYMBOLOGY_BY_KIND[kind];
    for (const [i, data] of req.labels.entries()) {
      const rect = rects[i];
      if (rect === undefined) throw new Error('no rect');
      const image = pages[rect.page];
      if (image === undefined) throw new Error('no page');
      const plan = planLabel(kind, stock, encodeSymbol(symbology, data.code)).symbol;
      const qz = plan.withQuietZone;
      const onPage = (r: { x: number; y: number; width: number; height: number }) => ({
        x: rect.xMm + r.x,
        y: rect.yMm + r.y,
        width: r.width,
        height: r.height,
      });

      // Crop the symbol with its quiet zone; the white border only gives the detectors the
      // margin they like, and the check below proves the printed quiet zone itself is clean.
      const cut = crop(image, onPage(qz), 12);
      expect(decodeWithZxingJs(cut, symbology), `@zxing/library, label ${i + 1}`).toBe(data.code);
      expect(await decodeWithZxingWasm(cut, symbology), `zxing-wasm, label ${i + 1}`).toEqual([data.code]);

      // The ink found around the symbol must be the symbol itself, where the plan says, within
      // 0.5 mm: this checks the label's position on the page and that the quiet zone is empty.
      const around = onPage({ x: qz.x - 0.4, y: qz.y - 0.4, width: qz.width + 0.8, height: qz.height + 0.8 });
      const ink = darkBox(image, around);
      const expected = onPage(plan.symbol);
      expect(ink, `ink near symbol ${i + 1}`).toBeDefined();
      if (ink === undefined) continue;
      expect(Math.abs(ink.x - expected.x)).toBeLessThan(0.5);
      expect(Math.abs(ink.y - expected.y)).toBeLessThan(0.5);
      expect(Math.abs(ink.x + ink.width - (expected.x + expected.width))).toBeLessThan(0.5);
      expect(Math.abs(ink.y + ink.height - (expected.y + expected.height))).toBeLessThan(0.5);
    }
  });
});

describe('renderLabelsPdf fonts', () => {
  it('embeds Inter 400 and 600 and JetBrains Mono, as poppler pdffonts lists them', async () => {
    const pdf = await renderLabelsPdf({ kind: 'specimen', stock: 'a4-3x8', labels: SAMPLES.specimen });
    const dir = await mkdtemp(join(tmpdir(), 'halfmark-fonts-'));
    try {
      await writeFile(join(dir, 'l.pdf'), pdf);
      const { stdout } = await run('/usr/bin/pdffonts', [join(dir, 'l.pdf')]);
      const rows = stdout.split('\n').slice(2).filter((l) => l.trim() !== '');
      const names = rows.map((r) => r.split(/\s+/)[0] ?? '');
      // pdf-lib names each subset after the face's PostScript name with a numeric suffix.
      expect(names.some((n) => n.startsWith('Inter-Regular'))).toBe(true);
      expect(names.some((n) => n.startsWith('Inter-SemiBold'))).toBe(true);
      expect(names.some((n) => n.startsWith('JetBrainsMono-Regular'))).toBe(true);
      // pdffonts' "emb" column says yes for every font: nothing is left to the viewer's fonts.
      for (const r of rows) expect(r).toMatch(/\s(yes)\s+(yes|no)\s+(yes|no)\s+\d+\s+\d+\s*$/);
      // The text layer maps back to Unicode (poppler pdftotext), so a printed sheet's PDF is searchable.
      const { stdout: text } = await run('/usr/bin/pdftotext', [join(dir, 'l.pdf'), '-']);
      expect(text).toContain('S26-00157-K');
      expect(text).toContain('Heat H24-7731');
      expect(text).toContain('Flat 12.5 mm · tensile');
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});

describe('renderLabelsPdf refuses bad requests with a LabelError and no PDF', () => {
  const specimen = SAMPLES.specimen[0] as LabelDataByKind['specimen'];

  async function refusal(req: unknown): Promise<LabelError> {
    try {
      await renderLabelsPdf(req as RenderRequest);
    } catch (err) {
      if (err instanceof LabelError) return err;
      throw err;
    }
    throw new Error('rendered a PDF for a bad request');
  }

  it('refuses an unknown stock', async () => {
    const err = await refusal({ kind: 'specimen', stock: 'roll-1x1', labels: [specimen] });
    expect(err.code).toBe('unknown-stock');
    expect(err.message).toContain('roll-1x1');
  });

  it('refuses an unknown kind', async () => {
    const err = await refusal({ kind: 'sticker', stock: 'a4-3x8', labels: [specimen] });
    expect(err.code).toBe('unknown-kind');
  });

  it('refuses an empty list and a missing list', async () => {
    expect((await refusal({ kind: 'specimen', stock: 'a4-3x8', labels: [] })).code).toBe('no-labels');
    expect((await refusal({ kind: 'specimen', stock: 'a4-3x8' })).code).toBe('no-labels');
  });

  it(`refuses more than ${MAX_LABELS_PER_PDF} labels, such as 10,000`, async () => {
    const labels = Array.from({ length: 10_000 }, () => specimen);
    const err = await refusal({ kind: 'specimen', stock: 'a4-3x8', labels });
    expect(err.code).toBe('too-many-labels');
    expect(err.message).toContain('2000');
  });

  it('refuses a start position off the sheet, and any but 1 on a roll', async () => {
    for (const startPosition of [0, 25, 1.5, -3]) {
      const err = await refusal({ kind: 'specimen', stock: 'a4-3x8', labels: [specimen], startPosition });
      expect(err.code).toBe('bad-start-position');
      expect(err.message).toContain('1 to 24');
    }
    const roll = await refusal({ kind: 'specimen', stock: 'roll-57x32', labels: [specimen], startPosition: 2 });
    expect(roll.code).toBe('bad-start-position');
  });

  it('refuses a code that is not printable ASCII, naming the label', async () => {
    const err = await refusal({
      kind: 'specimen',
      stock: 'a4-3x8',
      labels: [specimen, { ...specimen, code: 'S26-00157-É' }],
    });
    expect(err.code).toBe('code-not-encodable');
    expect(err.labelIndex).toBe(1);
  });

  it('refuses a label with a missing or empty field', async () => {
    const err = await refusal({ kind: 'half', stock: 'a4-3x8', labels: [{ code: 'S26-00157B-7', heat: 'H1', order: 'P1' }] });
    expect(err.code).toBe('invalid-label');
    expect(err.message).toContain('specimenCode');
    const empty = await refusal({ kind: 'badge', stock: 'a4-3x8', labels: [{ code: 'U-7KQ4M2-X', name: ' ', role: 'Technician' }] });
    expect(empty.code).toBe('invalid-label');
  });

  it('refuses a code too long for the stock rather than printing it too small to scan', async () => {
    const err = await refusal({
      kind: 'container',
      stock: 'roll-51x25',
      labels: [{ code: 'C-0000000000000000000000000042-*', containerType: 'Box', name: 'Long' }],
    });
    expect(err.code).toBe('code-too-long-for-stock');
  });
});

describe('renderLabelsPdf at volume', () => {
  it('renders 1,000 specimen labels on A4 sheets (42 pages of 24)', async () => {
    const labels = Array.from({ length: 1000 }, (_, i) => ({
      code: `S26-${String(i + 1).padStart(5, '0')}-${'0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ*'[i % 37]}`,
      heat: `H26-${1000 + (i % 17)}`,
      order: `PO-2026-${String(100 + (i % 9)).padStart(4, '0')}`,
    }));
    const pdf = await renderLabelsPdf({ kind: 'specimen', stock: 'a4-3x8', labels });
    const doc = await PDFDocument.load(pdf);
    expect(doc.getPageCount()).toBe(Math.ceil(1000 / 24));
    // The last label sits on the last page, position 1000 - 41 × 24 = 16; decode it there.
    const last = labelRects('a4-3x8', 1000)[999];
    expect(last?.page).toBe(41);
    expect(last?.position).toBe(16);
    const lastLabel = labels[999];
    if (last === undefined || lastLabel === undefined) throw new Error('no last label');
    const [image] = await rasterise(pdf, [42]);
    if (image === undefined) throw new Error('no page');
    const qz = planLabel('specimen', findStock('a4-3x8') as Stock, encodeSymbol('datamatrix', lastLabel.code)).symbol.withQuietZone;
    const cut = crop(image, { x: last.xMm + qz.x, y: last.yMm + qz.y, width: qz.width, height: qz.height }, 12);
    expect(decodeWithZxingJs(cut, 'datamatrix')).toBe(lastLabel.code);
  });
});
