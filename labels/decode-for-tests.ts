/**
 * Test support: rasterise a PDF page with poppler's pdftoppm and decode symbols with two
 * decoders that share no code with bwip-js: @zxing/library (JavaScript) and zxing-wasm (the
 * C++ ZXing reader compiled to WebAssembly).
 */
import { execFile } from 'node:child_process';
import { mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { promisify } from 'node:util';
import {
  BarcodeFormat,
  BinaryBitmap,
  DecodeHintType,
  HybridBinarizer,
  MultiFormatReader,
  RGBLuminanceSource,
} from '@zxing/library';
import { PNG } from 'pngjs';
import { prepareZXingModule, readBarcodes } from 'zxing-wasm/reader';
import type { Symbology } from './symbols';

const run = promisify(execFile);

/** The raster resolution the tests print at: a common office and thermal printer class. */
export const DPI = 300;

/** A grey page: one luminance byte per pixel (0 black, 255 white). */
export interface GreyImage {
  readonly width: number;
  readonly height: number;
  readonly lum: Uint8Array;
}

/**
 * Rasterises pages of `pdf` at DPI with /usr/bin/pdftoppm, greyscale, anti-aliased: pages 1 to
 * `pages` when a number, else the listed 1-based page numbers. The images come back in order.
 */
export async function rasterise(pdf: Uint8Array, pages: number | readonly number[]): Promise<GreyImage[]> {
  const dir = await mkdtemp(join(tmpdir(), 'halfmark-labels-'));
  try {
    const file = join(dir, 'in.pdf');
    await writeFile(file, pdf);
    const numbers = typeof pages === 'number' ? Array.from({ length: pages }, (_, i) => i + 1) : pages;
    const images: GreyImage[] = [];
    for (const p of numbers) {
      const out = join(dir, `page-${p}`);
      await run('/usr/bin/pdftoppm', ['-r', String(DPI), '-gray', '-png', '-f', String(p), '-l', String(p), '-singlefile', file, out]);
      const png = PNG.sync.read(await readFile(`${out}.png`));
      const lum = new Uint8Array(png.width * png.height);
      for (let i = 0; i < lum.length; i++) lum[i] = png.data[i * 4] ?? 255;
      images.push({ width: png.width, height: png.height, lum });
    }
    return images;
  } finally {
    await rm(dir, { recursive: true, force: true });
  }
}

/** Millimetres to pixels at DPI. */
export const px = (mm: number): number => (mm / 25.4) * DPI;

/** A rectangle in mm from the page's top-left corner. */
export interface PageRectMm {
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

/** Cuts `rect` out of `page`, with `borderPx` of white added around it. */
export function crop(page: GreyImage, rect: PageRectMm, borderPx = 0): GreyImage {
  const x0 = Math.max(0, Math.round(px(rect.x)));
  const y0 = Math.max(0, Math.round(px(rect.y)));
  const x1 = Math.min(page.width, Math.round(px(rect.x + rect.width)));
  const y1 = Math.min(page.height, Math.round(px(rect.y + rect.height)));
  const width = x1 - x0 + 2 * borderPx;
  const height = y1 - y0 + 2 * borderPx;
  const lum = new Uint8Array(width * height).fill(255);
  for (let y = y0; y < y1; y++) {
    const from = y * page.width;
    lum.set(page.lum.subarray(from + x0, from + x1), (y - y0 + borderPx) * width + borderPx);
  }
  return { width, height, lum };
}

/** Bounding box (mm, page coordinates) of pixels darker than mid-grey inside `rect`, if any. */
export function darkBox(page: GreyImage, rect: PageRectMm): PageRectMm | undefined {
  const x0 = Math.max(0, Math.round(px(rect.x)));
  const y0 = Math.max(0, Math.round(px(rect.y)));
  const x1 = Math.min(page.width, Math.round(px(rect.x + rect.width)));
  const y1 = Math.min(page.height, Math.round(px(rect.y + rect.height)));
  let minX = Infinity;
  let minY = Infinity;
  let maxX = -Infinity;
  let maxY = -Infinity;
  for (let y = y0; y < y1; y++) {
    for (let x = x0; x < x1; x++) {
      if ((page.lum[y * page.width + x] ?? 255) < 128) {
        minX = Math.min(minX, x);
        maxX = Math.max(maxX, x);
        minY = Math.min(minY, y);
        maxY = Math.max(maxY, y);
      }
    }
  }
  if (minX === Infinity) return undefined;
  const mm = (p: number): number => (p / DPI) * 25.4;
  return { x: mm(minX), y: mm(minY), width: mm(maxX + 1 - minX), height: mm(maxY + 1 - minY) };
}

/** Decodes one symbol with @zxing/library; undefined when nothing is found. */
export function decodeWithZxingJs(image: GreyImage, symbology: Symbology): string | undefined {
  const reader = new MultiFormatReader();
  const hints = new Map<DecodeHintType, unknown>([
    [DecodeHintType.POSSIBLE_FORMATS, [symbology === 'datamatrix' ? BarcodeFormat.DATA_MATRIX : BarcodeFormat.CODE_128]],
    [DecodeHintType.TRY_HARDER, true],
  ]);
  const source = new RGBLuminanceSource(new Uint8ClampedArray(image.lum), image.width, image.height);
  try {
    return reader.decode(new BinaryBitmap(new HybridBinarizer(source)), hints).getText();
  } catch {
    return undefined;
  }
}

let wasmReady: Promise<unknown> | undefined;

/** Loads zxing-wasm's reader from node_modules (it would otherwise try to download it). */
function prepareWasm(): Promise<unknown> {
  if (wasmReady === undefined) {
    const wasmPath = createRequire(import.meta.url).resolve('zxing-wasm/reader/zxing_reader.wasm');
    wasmReady = readFile(wasmPath).then((wasmBinary) =>
      prepareZXingModule({ overrides: { wasmBinary: wasmBinary.buffer.slice(wasmBinary.byteOffset, wasmBinary.byteOffset + wasmBinary.byteLength) }, fireImmediately: true }),
    );
  }
  return wasmReady;
}

/** Decodes one symbol with zxing-wasm; the texts of every symbol found. */
export async function decodeWithZxingWasm(image: GreyImage, symbology: Symbology): Promise<string[]> {
  await prepareWasm();
  const png = new PNG({ width: image.width, height: image.height, colorType: 0, inputColorType: 0, inputHasAlpha: false });
  png.data = Buffer.from(image.lum);
  const bytes = PNG.sync.write(png, { colorType: 0, inputColorType: 0, inputHasAlpha: false });
  const results = await readBarcodes(new Uint8Array(bytes), {
    formats: [symbology === 'datamatrix' ? 'DataMatrix' : 'Code128'],
    tryHarder: true,
    maxNumberOfSymbols: 4,
  });
  return results.filter((r) => r.isValid).map((r) => r.text);
}
