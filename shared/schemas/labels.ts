/** Label printing: which items, which kind of label, on which stock. */
import { z } from 'zod';
import type { CodeKind } from '../domain/codes';

/** Label kinds the API prints (the same keys as the label renderer's kinds). */
export const LABEL_PRINT_KINDS = ['specimen', 'half', 'bag', 'container', 'badge'] as const;

/** One label kind. */
export type LabelPrintKind = (typeof LABEL_PRINT_KINDS)[number];

/** Most labels one POST /api/labels may ask for: about 84 A4 sheets. */
export const MAX_LABELS_PER_REQUEST = 2000;

/** Longest reprint reason. */
export const MAX_REPRINT_REASON = 500;

/** Which code kind each label kind prints: a bag label goes on a container of any type. */
export const CODE_KIND_FOR_LABEL: Readonly<Record<LabelPrintKind, CodeKind>> = {
  specimen: 'specimen',
  half: 'half',
  bag: 'container',
  container: 'container',
  badge: 'badge',
};

/** What people call each label kind on screen. */
export const LABEL_KIND_NAMES: Readonly<Record<LabelPrintKind, string>> = {
  specimen: 'Specimen',
  half: 'Half',
  bag: 'Bag',
  container: 'Container',
  badge: 'Badge card',
};

/** The message for a request over the limit, shared by the server's early check and the schema. */
export function tooManyLabelsMessage(count: number): string {
  return `${count.toLocaleString('en-GB')} labels is more than the ${MAX_LABELS_PER_REQUEST.toLocaleString('en-GB')} one request may print; print them in batches of ${MAX_LABELS_PER_REQUEST.toLocaleString('en-GB')} or fewer.`;
}

const CodeTextSchema = z
  .string({ error: 'Each code is text, such as S26-00157-W.' })
  .trim()
  .min(1, { error: 'A code is empty: scan or type it, or remove the line.' })
  .max(64, { error: 'A code is at most 64 characters.' });

/** POST /api/labels: the codes are checked one by one by the server, which names any bad one. */
export const LabelPrintSchema = z.strictObject({
  kind: z.enum(LABEL_PRINT_KINDS, { error: `Choose a label kind: ${LABEL_PRINT_KINDS.join(', ')}.` }),
  codes: z
    .array(CodeTextSchema, { error: 'Send the codes to print as a list.' })
    .min(1, { error: 'Choose at least one item to print a label for.' })
    .max(MAX_LABELS_PER_REQUEST, {
      error: (issue) => tooManyLabelsMessage(Array.isArray(issue.input) ? issue.input.length : MAX_LABELS_PER_REQUEST + 1),
    }),
  stock: z
    .string({ error: 'Choose a label stock.' })
    .trim()
    .min(1, { error: 'Choose a label stock.' })
    .max(64, { error: 'A stock key is at most 64 characters.' }),
  /** 1-based position on the first sheet (left to right, then down); rolls only have 1. */
  startPosition: z
    .number({ error: 'The start position is a whole number, 1 for the first label on the sheet.' })
    .int({ error: 'The start position is a whole number.' })
    .min(1, { error: 'The start position counts from 1.' })
    .optional(),
  /** Required when any item had a label printed before. */
  reprint: z
    .strictObject({
      reason: z
        .string({ error: 'Say why the labels are printed again.' })
        .trim()
        .min(1, { error: 'Say why the labels are printed again (worn, lost, smudged …).' })
        .max(MAX_REPRINT_REASON, { error: `Keep the reason under ${MAX_REPRINT_REASON} characters.` }),
    })
    .optional(),
});

/** A print request as sent. */
export type LabelPrintRequest = z.input<typeof LabelPrintSchema>;

/** A print request after validation. */
export type LabelPrint = z.output<typeof LabelPrintSchema>;

/** One stock as GET /api/labels/stocks lists it. */
export interface LabelStockView {
  key: string;
  name: string;
  kind: 'roll' | 'sheet';
  columns: number;
  rows: number;
  /** Label positions on one page: 1 for a roll. */
  positionsPerPage: number;
  labelWidthMm: number;
  labelHeightMm: number;
  pageWidthMm: number;
  pageHeightMm: number;
}

/** GET /api/labels/stocks */
export interface LabelStocksResponse {
  stocks: LabelStockView[];
  maxLabels: number;
}

/** Response headers of a printed PDF, for clients that want the counts without reading the PDF. */
export const LABEL_HEADERS = {
  /** Labels in the PDF. */
  labels: 'X-Halfmark-Labels',
  /** Ledger events recorded (0 for badge cards, which are not ledger items). */
  events: 'X-Halfmark-Events',
  /** Codes whose print was a reprint, comma-separated; absent when none. */
  reprinted: 'X-Halfmark-Reprinted',
} as const;
