/**
 * The app's shipped fonts, embedded into label PDFs: Inter 400 and 600, JetBrains Mono 400.
 *
 * The latin files cover English and western European text. A character they lack is drawn from
 * the same family's latin-ext file (embedded only when a PDF needs it), and anything neither
 * covers becomes "?", so a label never shows an empty box.
 */
import { readFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import fontkit from '@pdf-lib/fontkit';
import type { PDFDocument, PDFFont } from 'pdf-lib';
import type { Face } from './layouts';

interface FaceFile {
  readonly pkg: '@fontsource/inter' | '@fontsource/jetbrains-mono';
  readonly file: string;
}

const FACE_FILES: Readonly<Record<Face, { latin: FaceFile; ext: FaceFile }>> = {
  regular: {
    latin: { pkg: '@fontsource/inter', file: 'inter-latin-400-normal.woff' },
    ext: { pkg: '@fontsource/inter', file: 'inter-latin-ext-400-normal.woff' },
  },
  bold: {
    latin: { pkg: '@fontsource/inter', file: 'inter-latin-600-normal.woff' },
    ext: { pkg: '@fontsource/inter', file: 'inter-latin-ext-600-normal.woff' },
  },
  mono: {
    latin: { pkg: '@fontsource/jetbrains-mono', file: 'jetbrains-mono-latin-400-normal.woff' },
    ext: { pkg: '@fontsource/jetbrains-mono', file: 'jetbrains-mono-latin-ext-400-normal.woff' },
  },
};

const FACES: readonly Face[] = ['regular', 'bold', 'mono'];

interface FontData {
  readonly bytes: Uint8Array;
  readonly codePoints: ReadonlySet<number>;
}

type FaceData = Readonly<Record<Face, { latin: FontData; ext: FontData }>>;

const require = createRequire(import.meta.url);
let faceData: Promise<FaceData> | undefined;

async function loadFont(f: FaceFile): Promise<FontData> {
  // The packages export only CSS; their root entry resolves to index.css beside files/.
  const root = dirname(require.resolve(f.pkg));
  const bytes = new Uint8Array(await readFile(join(root, 'files', f.file)));
  return { bytes, codePoints: new Set(fontkit.create(bytes).characterSet) };
}

/** Reads the font files once per process. */
function loadFaceData(): Promise<FaceData> {
  faceData ??= (async () => {
    const entries = await Promise.all(
      FACES.map(async (face) => {
        const [latin, ext] = await Promise.all([loadFont(FACE_FILES[face].latin), loadFont(FACE_FILES[face].ext)]);
        return [face, { latin, ext }] as const;
      }),
    );
    return Object.fromEntries(entries) as Record<Face, { latin: FontData; ext: FontData }>;
  })();
  return faceData;
}

// OpenType shaping features fontkit applies by default. Labels need none of them (no
// ligatures, no contextual alternates, no marks to place), and shaping every string with them
// made a 1,000-label sheet about ten times slower. Fresh object per call: fontkit mutates it.
const noFeatures = (): Record<string, boolean> =>
  Object.fromEntries(
    ['calt', 'liga', 'clig', 'rlig', 'dlig', 'kern', 'ccmp', 'locl', 'mark', 'mkmk', 'rclt', 'curs', 'rvrn'].map((f) => [f, false]),
  );

interface Run {
  readonly font: PDFFont;
  readonly text: string;
}

// Control characters have no glyph and would break a line; a space keeps words apart.
const CONTROL = /[\u0000-\u001f\u007f-\u009f]/g;

/** Removes characters that have no place on a one-line label field. */
export function cleanText(text: string): string {
  return text.replace(CONTROL, ' ');
}

/** The faces embedded in one PDF, with measuring and drawing that respect font coverage. */
export class EmbeddedFaces {
  private constructor(
    private readonly data: FaceData,
    private readonly latin: Readonly<Record<Face, PDFFont>>,
    private readonly ext: Readonly<Partial<Record<Face, PDFFont>>>,
  ) {}

  /**
   * Embeds the three faces (subset, as .woff: STACK.md) into `doc`, plus the latin-ext file of
   * any face whose `texts` need it.
   */
  static async embed(doc: PDFDocument, texts: Iterable<readonly [Face, string]>): Promise<EmbeddedFaces> {
    doc.registerFontkit(fontkit);
    const data = await loadFaceData();
    const needExt = new Set<Face>();
    for (const [face, text] of texts) {
      if (needExt.has(face)) continue;
      const { latin, ext } = data[face];
      for (const ch of text) {
        const cp = ch.codePointAt(0) ?? 0;
        if (!latin.codePoints.has(cp) && ext.codePoints.has(cp)) {
          needExt.add(face);
          break;
        }
      }
    }
    const latin = {} as Record<Face, PDFFont>;
    const ext: Partial<Record<Face, PDFFont>> = {};
    for (const face of FACES) {
      latin[face] = await doc.embedFont(data[face].latin.bytes, { subset: true, features: noFeatures() });
      if (needExt.has(face)) ext[face] = await doc.embedFont(data[face].ext.bytes, { subset: true, features: noFeatures() });
    }
    return new EmbeddedFaces(data, latin, ext);
  }

  private runs(text: string, face: Face): Run[] {
    const runs: { font: PDFFont; text: string }[] = [];
    const { latin, ext } = this.data[face];
    const extFont = this.ext[face];
    for (const ch of cleanText(text)) {
      const cp = ch.codePointAt(0) ?? 0;
      let font = this.latin[face];
      let out = ch;
      if (!latin.codePoints.has(cp)) {
        if (extFont !== undefined && ext.codePoints.has(cp)) font = extFont;
        else out = '?';
      }
      const last = runs[runs.length - 1];
      if (last !== undefined && last.font === font) last.text += out;
      else runs.push({ font, text: out });
    }
    return runs;
  }

  private readonly unitWidths = new Map<string, number>();

  /** Width of `text` in points at `sizePt`. */
  widthPt(text: string, face: Face, sizePt: number): number {
    // Width is proportional to size; heats, orders and titles repeat across a sheet.
    const key = `${face}\u0000${text}`;
    let unit = this.unitWidths.get(key);
    if (unit === undefined) {
      unit = this.runs(text, face).reduce((w, r) => w + r.font.widthOfTextAtSize(r.text, 1), 0);
      this.unitWidths.set(key, unit);
    }
    return unit * sizePt;
  }

  private readonly encoded = new Map<string, readonly { font: PDFFont; hex: string; unitWidth: number }[]>();

  /**
   * Content-stream text that draws `text` in black with its baseline starting at (xPt, yPt).
   * `fontKey` names a font in the page's resources. Encoded runs are cached: heats, orders and
   * titles repeat across a sheet, and encoding (glyph lookup) is the slow part of text.
   */
  textContent(text: string, face: Face, xPt: number, yPt: number, sizePt: number, fontKey: (font: PDFFont) => string): string {
    const key = `${face}\u0000${text}`;
    let runs = this.encoded.get(key);
    if (runs === undefined) {
      runs = this.runs(text, face).map((r) => ({
        font: r.font,
        // encodeText also records the glyphs the subset must keep.
        hex: r.font.encodeText(r.text).toString(),
        unitWidth: r.font.widthOfTextAtSize(r.text, 1),
      }));
      this.encoded.set(key, runs);
    }
    const parts: string[] = ['q 0 g BT'];
    let x = xPt;
    for (const r of runs) {
      parts.push(`${fontKey(r.font)} ${num(sizePt)} Tf 1 0 0 1 ${num(x)} ${num(yPt)} Tm ${r.hex} Tj`);
      x += r.unitWidth * sizePt;
    }
    parts.push('ET Q\n');
    return parts.join('\n');
  }
}

const num = (n: number): string => String(Math.round(n * 1000) / 1000);
