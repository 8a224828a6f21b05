import type { ColumnDef } from '@tanstack/react-table';
import { useState } from 'react';
import type { LabelPrintKind } from '../../../../shared/schemas/labels';
import { useCan } from '../../auth/api/queries';
import { PrintLabelsLink } from './print-labels-link';

/** Codes ticked in a list, kept across pages and searches until cleared. */
export interface LabelSelection {
  codes: readonly string[];
  has: (code: string) => boolean;
  toggle: (code: string, on: boolean) => void;
  setMany: (codes: readonly string[], on: boolean) => void;
  clear: () => void;
}

/** Holds a list's ticked codes, in the order they were ticked (the order labels print in). */
export function useLabelSelection(): LabelSelection {
  const [codes, setCodes] = useState<readonly string[]>([]);
  const setMany = (many: readonly string[], on: boolean) =>
    setCodes((current) => (on ? [...current, ...many.filter((c) => !current.includes(c))] : current.filter((c) => !many.includes(c))));
  return {
    codes,
    has: (code) => codes.includes(code),
    toggle: (code, on) => setMany([code], on),
    setMany,
    clear: () => setCodes([]),
  };
}

/**
 * A first column of tick boxes for a list whose rows carry codes: one per row, and one in the
 * header for every row on the page. Only for people who print labels.
 *
 * @param selection - From useLabelSelection().
 * @param codeOf - The code of a row.
 * @param pageCodes - The codes of the rows on screen, for the header's box.
 */
export function selectionColumn<T>(selection: LabelSelection, codeOf: (row: T) => string, pageCodes: readonly string[]): ColumnDef<T> {
  const all = pageCodes.length > 0 && pageCodes.every((c) => selection.has(c));
  return {
    id: 'select',
    header: () => (
      <input
        type="checkbox"
        className="h-5 w-5 accent-temper-600"
        aria-label="Tick every row on this page for labels"
        checked={all}
        onChange={(e) => selection.setMany(pageCodes, e.target.checked)}
      />
    ),
    cell: ({ row }) => {
      const code = codeOf(row.original);
      return (
        <input
          type="checkbox"
          className="h-5 w-5 accent-temper-600"
          aria-label={`Tick ${code} for labels`}
          checked={selection.has(code)}
          onChange={(e) => selection.toggle(code, e.target.checked)}
        />
      );
    },
  };
}

/** The ticked count with "Print labels" and "Clear"; nothing while none are ticked. */
export function LabelSelectionBar({ kind, selection }: { kind: LabelPrintKind; selection: LabelSelection }) {
  const canPrint = useCan('labels.print');
  if (!canPrint || selection.codes.length === 0) return null;
  const n = selection.codes.length;
  return (
    <div role="status" className="mb-3 flex flex-wrap items-center gap-3 rounded-md bg-temper-50 px-3 py-2 ring-1 ring-temper-200" data-testid="label-selection">
      <span className="text-body font-semibold text-ink-800">
        {n} ticked for labels
      </span>
      <PrintLabelsLink kind={kind} codes={selection.codes} label={`Print ${n} label${n === 1 ? '' : 's'}`} variant="primary" />
      <button type="button" onClick={selection.clear} className="text-body font-semibold text-temper-700 underline">
        Clear
      </button>
    </div>
  );
}

/** Whether this person may tick rows for labels (the column is left out otherwise). */
export function useCanPrintLabels(): boolean {
  return useCan('labels.print');
}
