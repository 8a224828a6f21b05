/**
 * Draws the installed app's icons from our own mark (public/halfmark.svg) with Debian's chromium
 * and writes them to public/icons/. Run `tsx scripts/make-app-icons.ts` after changing the mark;
 * the PNGs are committed, so a build needs no browser.
 */
import { mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import { launchChromium } from './lib/chromium';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** One icon file: its name under public/icons/, its size in pixels, and how it is drawn. */
export interface AppIcon {
  file: string;
  size: number;
  /** "plain": the mark as drawn, rounded corners see-through; "full-bleed": the mark on a square of its own background, with room for the launcher's mask. */
  kind: 'plain' | 'full-bleed';
}

/** Every icon the manifest and index.html name. */
export const APP_ICONS: readonly AppIcon[] = [
  { file: 'halfmark-192.png', size: 192, kind: 'plain' },
  { file: 'halfmark-512.png', size: 512, kind: 'plain' },
  { file: 'halfmark-maskable-512.png', size: 512, kind: 'full-bleed' },
  { file: 'halfmark-touch-180.png', size: 180, kind: 'full-bleed' },
];

/**
 * The mark as a full-bleed square: the 32-unit mark inside a 40-unit square of its own background
 * colour. The diamond then reaches about 31 % of the width from the centre, inside the 40 % circle
 * that launchers promise to keep when they mask an icon (the W3C manifest's "maskable" purpose).
 *
 * @param markSvg - The mark's SVG text.
 */
export function fullBleedSvg(markSvg: string): string {
  const background = /<rect[^>]*fill="(#[0-9a-fA-F]{3,8})"/.exec(markSvg)?.[1];
  if (!background) throw new Error('The mark has no background rectangle to take the colour from.');
  const inner = markSvg.replace(/^<svg[^>]*>/, '').replace(/<\/svg>\s*$/, '');
  return `<svg xmlns="http://www.w3.org/2000/svg" viewBox="-4 -4 40 40"><rect x="-4" y="-4" width="40" height="40" fill="${background}"/><svg x="0" y="0" width="32" height="32" viewBox="0 0 32 32">${inner}</svg></svg>`;
}

/** Renders every icon into public/icons/ and returns the files written. */
export async function makeAppIcons(): Promise<string[]> {
  const mark = readFileSync(path.join(root, 'public', 'halfmark.svg'), 'utf8').trim();
  const outDir = path.join(root, 'public', 'icons');
  mkdirSync(outDir, { recursive: true });
  const browser = await launchChromium();
  const written: string[] = [];
  try {
    for (const icon of APP_ICONS) {
      const svg = icon.kind === 'plain' ? mark : fullBleedSvg(mark);
      const page = await browser.newPage({ viewport: { width: icon.size, height: icon.size }, deviceScaleFactor: 1 });
      const src = `data:image/svg+xml;base64,${Buffer.from(svg).toString('base64')}`;
      await page.setContent(`<html><body style="margin:0;background:transparent"><img src="${src}" width="${icon.size}" height="${icon.size}" style="display:block"></body></html>`);
      await page.locator('img').evaluate((img: HTMLImageElement) => img.decode());
      const png = await page.screenshot({ omitBackground: true, clip: { x: 0, y: 0, width: icon.size, height: icon.size } });
      await page.close();
      const file = path.join(outDir, icon.file);
      writeFileSync(file, png);
      written.push(file);
    }
  } finally {
    await browser.close();
  }
  return written;
}

if (process.argv[1] && import.meta.url === pathToFileURL(process.argv[1]).href) {
  makeAppIcons()
    .then((files) => {
      for (const f of files) console.log(`wrote ${path.relative(root, f)}`);
    })
    .catch((err: unknown) => {
      console.error(err);
      process.exit(1);
    });
}
