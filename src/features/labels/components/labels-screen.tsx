import { useEffect, useMemo, useRef, useState } from 'react';
import { useSearchParams } from 'react-router-dom';
import {
  CODE_KIND_FOR_LABEL,
  LABEL_KIND_NAMES,
  LABEL_PRINT_KINDS,
  type LabelPrintKind,
  type LabelStockView,
} from '../../../../shared/schemas/labels';
import { codePatternHint } from '../../../../shared/domain/codes';
import { Button } from '../../../components/ui/button';
import { FormAlert, SelectField, TextAreaField } from '../../../components/ui/form-field';
import { PageHeader } from '../../../components/ui/page-header';
import { useCan } from '../../auth/api/queries';
import { ApiError } from '../../../lib/api-client';
import { usePrintLabels, useLabelStocks, type PrintedLabels } from '../api/labels';
import { goodCodes, readCodeLines } from '../code-lines';
import { ItemListField } from './item-list-field';
import { StartPositionPicker } from './start-position-picker';

const KIND_HINTS: Record<LabelPrintKind, string> = {
  specimen: 'Data Matrix with the code, heat and order, for the specimen as machined.',
  half: 'Data Matrix for a half after a test: its own code and its specimen’s.',
  bag: 'Code 128 for a bag of retained halves: its code and name.',
  container: 'Code 128 for a bin, box, shelf or cart.',
  badge: 'Code 128 badge card a person scans to take over a shared station.',
};

const STOCK_MEMORY = 'halfmark.labels.stock.';

function isKind(value: string | null): value is LabelPrintKind {
  return value !== null && (LABEL_PRINT_KINDS as readonly string[]).includes(value);
}

function rememberedStock(kind: LabelPrintKind, stocks: readonly LabelStockView[]): string | undefined {
  let key: string | null = null;
  try {
    key = window.localStorage.getItem(STOCK_MEMORY + kind);
  } catch {
    // Storage can be off (private windows); the first stock is then the default.
  }
  return stocks.find((s) => s.key === key)?.key ?? stocks[0]?.key;
}

/** What the server said about which field, from an error answer. */
interface ServerIssues {
  message: string | null;
  reason?: string;
  stock?: string;
  startPosition?: string;
  /** By code: unknown, printed before, wrong state … */
  codes: Map<string, string>;
}

function readIssues(error: unknown, sent: readonly string[]): ServerIssues {
  const out: ServerIssues = { message: null, codes: new Map() };
  if (!error) return out;
  if (!(error instanceof ApiError)) return { ...out, message: 'Something went wrong; try again.' };
  out.message = error.message;
  const details = Array.isArray(error.details) ? (error.details as { path?: unknown; message?: unknown }[]) : [];
  for (const d of details) {
    if (typeof d.path !== 'string' || typeof d.message !== 'string') continue;
    if (d.path === 'reprint.reason') out.reason = d.message;
    else if (d.path === 'stock') out.stock = d.message;
    else if (d.path === 'startPosition') out.startPosition = d.message;
    else if (d.path.startsWith('codes.')) {
      const code = sent[Number(d.path.slice('codes.'.length))];
      if (code !== undefined) out.codes.set(code, d.message);
    }
  }
  return out;
}

/** The PDF the server made, in a frame, with print, open and download. */
function Preview({ printed }: { printed: PrintedLabels }) {
  const frame = useRef<HTMLIFrameElement>(null);
  const [url, setUrl] = useState<string | null>(null);
  useEffect(() => {
    const made = URL.createObjectURL(printed.pdf);
    setUrl(made);
    return () => URL.revokeObjectURL(made);
  }, [printed.pdf]);
  if (url === null) return null;
  return (
    <section aria-label="Preview" className="flex flex-col gap-3">
      <div role="status" className="rounded-md bg-good-100 p-3 text-body text-good-700" data-testid="label-result">
        <p className="font-semibold">
          <span aria-hidden>● </span>
          {printed.labels} label{printed.labels === 1 ? '' : 's'} made.{' '}
          {printed.events > 0
            ? `${printed.events} print${printed.events === 1 ? '' : 's'} recorded in the ledger.`
            : 'Badge cards are not ledger items; nothing was recorded.'}
        </p>
        {printed.reprinted.length > 0 ? (
          <p className="mt-1">
            Reprinted: <span className="font-mono">{printed.reprinted.join(', ')}</span>
          </p>
        ) : null}
        <p className="mt-1 text-caption">Print at 100 % (“actual size”) so the labels line up with the sheet.</p>
      </div>
      <div className="flex flex-wrap gap-2">
        <Button onClick={() => frame.current?.contentWindow?.print()} size="lg">
          Print
        </Button>
        <a href={url} target="_blank" rel="noopener" className="inline-flex h-12 items-center rounded-md px-4 font-semibold text-ink-700 ring-1 ring-inset ring-ink-300 hover:bg-ink-50">
          Open PDF
        </a>
        <a href={url} download={printed.fileName} className="inline-flex h-12 items-center rounded-md px-4 font-semibold text-ink-700 ring-1 ring-inset ring-ink-300 hover:bg-ink-50">
          Download
        </a>
      </div>
      <iframe ref={frame} title="Label preview" src={url} className="h-[70vh] min-h-96 w-full rounded-card bg-ink-100 ring-1 ring-ink-200" data-testid="label-preview" />
    </section>
  );
}

/**
 * The labels page: choose the items (scan, paste, or arrive with ?kind=…&codes=… from another
 * screen), the kind of label, the stock and where on the sheet to start; the server makes the PDF
 * and records every print in the ledger, then the PDF shows here to print.
 */
export function LabelsScreen() {
  const [params] = useSearchParams();
  const canBadges = useCan('users.write');
  const stocks = useLabelStocks();
  const print = usePrintLabels();
  const kindsOffered = LABEL_PRINT_KINDS.filter((k) => k !== 'badge' || canBadges);

  const [kind, setKind] = useState<LabelPrintKind>(() => {
    const asked = params.get('kind');
    return isKind(asked) ? asked : 'specimen';
  });
  const [text, setText] = useState(() => (params.get('codes') ?? '').split(',').filter((c) => c.trim() !== '').join('\n'));
  const [stockKey, setStockKey] = useState<string | undefined>(undefined);
  const [start, setStart] = useState(1);
  const [reason, setReason] = useState('');
  const [askReason, setAskReason] = useState(false);
  const [sent, setSent] = useState<string[]>([]);

  const stockList = stocks.data?.stocks ?? [];
  const chosenKey = stockKey ?? rememberedStock(kind, stockList);
  const stock = stockList.find((s) => s.key === chosenKey);
  const lines = useMemo(() => readCodeLines(text, CODE_KIND_FOR_LABEL[kind]), [text, kind]);
  const codes = goodCodes(lines);
  const problems = lines.filter((l) => l.kind === 'problem').length;
  const issues = readIssues(print.error, sent);
  const max = stocks.data?.maxLabels ?? Infinity;

  useEffect(() => {
    if (print.error instanceof ApiError && print.error.code === 'reprint_reason_required') setAskReason(true);
  }, [print.error]);

  const chooseKind = (next: LabelPrintKind) => {
    setKind(next);
    setStockKey(undefined);
    setStart(1);
    print.reset();
  };
  const chooseStock = (key: string) => {
    setStockKey(key);
    setStart(1);
    try {
      window.localStorage.setItem(STOCK_MEMORY + kind, key);
    } catch {
      // Not remembering the stock is harmless.
    }
  };

  const blocked =
    codes.length === 0
      ? 'Add at least one code.'
      : problems > 0
        ? `Fix or remove the ${problems} line${problems === 1 ? '' : 's'} marked ▲.`
        : codes.length > max
          ? `At most ${max.toLocaleString('en-GB')} labels at a time; split the list.`
          : stock === undefined
            ? 'Choose a stock.'
            : null;

  const submit = () => {
    if (blocked !== null || stock === undefined) return;
    setSent(codes);
    print.mutate({
      kind,
      codes,
      stock: stock.key,
      ...(stock.kind === 'sheet' ? { startPosition: start } : {}),
      ...(askReason && reason.trim() !== '' ? { reprint: { reason: reason.trim() } } : {}),
    });
  };

  return (
    <>
      <PageHeader title="Labels" subtitle="Every label made here is recorded in the ledger; a label made again asks for a reason." />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,24rem)_minmax(0,1fr)]">
        <form
          className="flex flex-col gap-5 rounded-card bg-white p-4 shadow-sm ring-1 ring-ink-100 md:p-5"
          onSubmit={(e) => {
            e.preventDefault();
            submit();
          }}
        >
          <fieldset className="flex flex-col gap-2">
            <legend className="text-body font-semibold text-ink-800">Kind of label</legend>
            <div className="grid grid-cols-2 gap-2 sm:grid-cols-3">
              {kindsOffered.map((k) => (
                <button
                  key={k}
                  type="button"
                  aria-pressed={k === kind}
                  onClick={() => chooseKind(k)}
                  className={`h-12 rounded-md px-3 text-body font-semibold ${k === kind ? 'bg-ink-900 text-white' : 'bg-white text-ink-800 ring-1 ring-inset ring-ink-300 hover:bg-ink-50'}`}
                >
                  {LABEL_KIND_NAMES[k]}
                </button>
              ))}
            </div>
            <p className="text-caption text-ink-500">{KIND_HINTS[kind]}</p>
          </fieldset>

          <ItemListField
            value={text}
            onChange={(value) => {
              setText(value);
              if (print.isError) print.reset();
            }}
            lines={lines}
            serverNotes={issues.codes}
            placeholder={`One code per line, such as ${codePatternHint(CODE_KIND_FOR_LABEL[kind])}`}
          />

          {stocks.isError ? <FormAlert>The list of stocks did not load: {stocks.error.message}</FormAlert> : null}
          <SelectField
            label="Stock"
            value={chosenKey ?? ''}
            onChange={(e) => chooseStock(e.target.value)}
            options={stockList.map((s) => ({ value: s.key, label: s.name }))}
            disabled={stockList.length === 0}
            error={issues.stock}
            data-testid="label-stock"
          />
          {stock?.kind === 'sheet' ? <StartPositionPicker stock={stock} value={start} onChange={setStart} error={issues.startPosition} /> : null}

          {askReason ? (
            <TextAreaField
              label="Why print again?"
              hint="Some of these items had a label before. The reason is kept with each reprint in the ledger."
              value={reason}
              onChange={(e) => setReason(e.target.value)}
              maxLength={500}
              error={issues.reason}
              data-testid="reprint-reason"
            />
          ) : null}

          {issues.message ? <FormAlert>{issues.message}</FormAlert> : null}
          <div className="flex flex-col gap-1">
            <Button type="submit" size="lg" busy={print.isPending} busyLabel={`Making ${codes.length} label${codes.length === 1 ? '' : 's'} …`} disabled={blocked !== null}>
              Make {codes.length > 0 ? `${codes.length} ` : ''}label{codes.length === 1 ? '' : 's'}
            </Button>
            {blocked !== null && lines.length > 0 ? <p className="text-caption text-ink-500">{blocked}</p> : null}
          </div>
        </form>

        <div>
          {print.data ? (
            <Preview printed={print.data} />
          ) : (
            <div className="flex h-full min-h-48 items-center justify-center rounded-card border-2 border-dashed border-ink-200 p-6 text-center text-body text-ink-500">
              The PDF shows here once it is made.
            </div>
          )}
        </div>
      </div>
    </>
  );
}
