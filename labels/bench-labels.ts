/**
 * Benchmark: one PDF of 1,000 specimen labels on A4 sheets (42 sheets of 3 × 8).
 * Aim (issue 6): under 2 s and under 400 MB peak memory.
 */
import { pathToFileURL } from 'node:url';
import { renderLabelsPdf } from './render';

/** What one benchmark run measured. */
export interface LabelBench {
  /** Wall time of the 1,000-label render, in milliseconds. */
  ms: number;
  /** Size of the PDF in bytes. */
  bytes: number;
  /** The process's peak resident memory so far, in MiB (includes whatever ran before). */
  peakRssMb: number;
}

const CHECK_CHARS = '0123456789ABCDEFGHIJKLMNOPQRSTUVWXYZ*';

/**
 * Renders 1,000 specimen labels (invented codes, heats and orders) on the A4 3 × 8 stock and
 * measures it. One single-label render runs first, untimed, so the figure is that of a server
 * that has printed before (fonts read, bwip-js warmed up) rather than of process start-up.
 */
export async function benchLabels(): Promise<LabelBench> {
  const labels = Array.from({ length: 1000 }, (_, i) => ({
    code: `S26-${String(i + 1).padStart(5, '0')}-${CHECK_CHARS[i % CHECK_CHARS.length]}`,
    heat: `H26-${1000 + (i % 17)}`,
    order: `PO-2026-${String(100 + (i % 9)).padStart(4, '0')}`,
    specimenLine: i % 2 === 0 ? 'Flat 12.5 mm · tensile' : 'Round 6 mm · tensile',
  }));
  await renderLabelsPdf({ kind: 'specimen', stock: 'a4-3x8', labels: labels.slice(0, 1) });
  const start = performance.now();
  const pdf = await renderLabelsPdf({ kind: 'specimen', stock: 'a4-3x8', labels });
  const ms = performance.now() - start;
  return { ms: Math.round(ms), bytes: pdf.byteLength, peakRssMb: Math.round(process.resourceUsage().maxRSS / 1024) };
}

if (process.argv[1] !== undefined && import.meta.url === pathToFileURL(process.argv[1]).href) {
  const r = await benchLabels();
  console.log(`labels: 1,000 on A4 in ${r.ms} ms, ${(r.bytes / 1024).toFixed(0)} kB, peak RSS ${r.peakRssMb} MB`);
}
