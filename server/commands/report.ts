/**
 * An order's results and verdicts, and issuing its signed test report: a unique number, the PDF
 * kept with its SHA-256, one `attached` ledger event per reported specimen citing that hash and
 * carrying the signature, and the issue date on the order, which retention counts from.
 */
import { createHash } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { PROPERTY_SYMBOL, type TensileProperty } from '../../shared/domain/tensile/compute';
import type { Verdict } from '../../shared/domain/tensile/specifications';
import { getGeometry } from '../../shared/domain/specimen-geometries';
import { SIGNATURE_MEANINGS } from '../../shared/schemas/auth';
import type { OrderResultsView, OrderSpecimenResults, ReportIssue, ReportIssued, ReportView } from '../../shared/schemas/reports';
import type { Role } from '../../shared/permissions';
import type { AppContext } from '../app';
import { consumeSignature } from '../auth/signatures';
import { AppError, conflict, notFound } from '../errors';
import { recordEvent } from './record-event';
import type { ReportDocument, ReportSpecimen } from './report-pdf';
import { currentResults, effectiveEvent, loadOrderSpecimens, resolveSpecification, verdictOf, type ResultsRow, type SpecimenRow } from './results';

/** Words for each verdict, as reports print them. */
export const VERDICT_WORDS: Readonly<Record<Verdict, string>> = {
  conforms: 'Conforms',
  'does-not-conform': 'Does not conform',
  'cannot-judge': 'Cannot be judged',
};

/** Specimen states that leave a specimen out of the report. */
const EXCLUDED_STATES: Readonly<Record<string, string>> = {
  rejected: 'rejected before test',
  none: 'its registration was voided',
};

/** Reported properties in print order; the fitted modulus is a plausibility check, not a result. */
const REPORTED: readonly TensileProperty[] = ['maxForce', 'tensileStrength', 'offsetYieldStrength', 'upperYieldStrength', 'elongation', 'reductionOfArea'];

const NAMES: Readonly<Record<TensileProperty, string>> = {
  maxForce: 'maximum force',
  tensileStrength: 'tensile strength',
  offsetYieldStrength: '0.2 % offset yield strength',
  upperYieldStrength: 'upper yield strength',
  modulus: 'fitted modulus',
  elongation: 'elongation after fracture',
  reductionOfArea: 'reduction of area',
};

interface OrderRow {
  id: number;
  number: string;
  customer_name: string;
  po_reference: string;
  material_spec: string;
  test_standard: string;
  status: string;
  report_issued_at: Date | null;
}

interface ReportRow {
  number: string;
  order_id: number;
  issued_at: Date;
  name: string;
  reason: string | null;
  supersedes: string | null;
  pdf_sha256: string;
  content: { overallVerdict?: Verdict | null };
}

/** Combines specimen verdicts: any that does not conform wins, then any that cannot be judged. */
export function combineVerdicts(verdicts: readonly (Verdict | null)[]): Verdict | null {
  const known = verdicts.filter((v): v is Verdict => v !== null);
  if (known.length === 0) return null;
  if (known.includes('does-not-conform')) return 'does-not-conform';
  if (known.includes('cannot-judge') || known.length < verdicts.length) return 'cannot-judge';
  return 'conforms';
}

function presentReport(r: ReportRow): ReportView {
  return {
    number: r.number,
    orderId: r.order_id,
    issuedAt: new Date(r.issued_at).toISOString(),
    issuedBy: r.name,
    reason: r.reason,
    supersedes: r.supersedes,
    sha256: r.pdf_sha256,
    href: `/api/reports/${r.number}/pdf`,
    verdict: r.content.overallVerdict ?? null,
  };
}

interface Assembled {
  view: OrderResultsView;
  rows: SpecimenRow[];
  results: Map<string, ResultsRow>;
  specName: string;
}

async function assemble(ctx: AppContext, orderId: number, canIssue: boolean, transaction?: Transaction): Promise<Assembled> {
  const { sequelize } = ctx;
  const [order] = await sequelize.query<OrderRow>(
    `SELECT o.id, o.number, c.name AS customer_name, o.po_reference, o.material_spec, o.test_standard, o.status, o.report_issued_at
       FROM orders o JOIN customers c ON c.id = o.customer_id WHERE o.id = $1${transaction ? ' FOR UPDATE OF o' : ''}`,
    { bind: [orderId], type: QueryTypes.SELECT, transaction },
  );
  if (!order) throw notFound(`No order has the id ${orderId}.`);
  const rows = await loadOrderSpecimens(sequelize, orderId, transaction);
  const results = await currentResults(sequelize, rows.map((r) => r.item_id), transaction);
  const { spec, resolution } = await resolveSpecification(sequelize, { id: order.id, materialSpec: order.material_spec });
  const specimens: OrderSpecimenResults[] = rows.map((r) => {
    const current = results.get(String(r.item_id));
    const excluded = EXCLUDED_STATES[r.state] ?? null;
    return {
      code: r.code,
      state: r.state,
      heatNumber: r.heat_number,
      sampleCode: r.sample_code,
      resultsId: current ? Number(current.id) : null,
      properties: current ? current.results.properties : null,
      verdict: excluded ? null : verdictOf(spec, current, r.thickness_mm),
      excluded,
    };
  });
  const included = specimens.filter((s) => s.excluded === null);
  const blockers: string[] = [];
  if (included.length === 0) blockers.push('The order has no specimens to report.');
  const missing = included.filter((s) => s.resultsId === null).map((s) => s.code);
  if (missing.length > 0) blockers.push(`No results yet for ${missing.join(', ')}.`);
  const reports = await sequelize.query<ReportRow>(
    `SELECT r.number, r.order_id, r.issued_at, u.name, r.reason, r.supersedes, r.pdf_sha256, r.content
       FROM test_reports r JOIN users u ON u.id = r.issued_by WHERE r.order_id = $1 ORDER BY r.id DESC`,
    { bind: [orderId], type: QueryTypes.SELECT, transaction },
  );
  const verdict = spec ? combineVerdicts(included.map((s) => s.verdict?.verdict ?? null)) : null;
  return {
    view: {
      order: {
        id: order.id,
        number: order.number,
        customerName: order.customer_name,
        poReference: order.po_reference,
        materialSpec: order.material_spec,
        testStandard: order.test_standard,
        status: order.status,
        reportIssuedAt: order.report_issued_at ? new Date(order.report_issued_at).toISOString() : null,
      },
      specification: resolution,
      specimens,
      verdict,
      reports: reports.map(presentReport),
      blockers,
      canIssue: canIssue && blockers.length === 0,
    },
    rows,
    results,
    specName: spec ? `${spec.designation} ${spec.grade} (${spec.source})` : resolution.status === 'none' ? `None: ${resolution.reason}` : '',
  };
}

/** GET /api/reports/orders/:orderId: the order's specimens with results and verdicts, and its reports. */
export async function buildOrderResults(ctx: AppContext, orderId: number, canIssue: boolean): Promise<OrderResultsView> {
  return (await assemble(ctx, orderId, canIssue)).view;
}

function dimensionsOf(payload: Record<string, unknown> | undefined): string {
  if (!payload) return 'not measured';
  const list = (key: string) => (Array.isArray(payload[key]) ? (payload[key] as unknown[]).map(String).join(', ') : null);
  if (payload.shape === 'round') return `diameter ${list('diameter') ?? '?'} mm`;
  return `width ${list('width') ?? '?'} mm; thickness ${list('thickness') ?? '?'} mm`;
}

function resultLine(row: ResultsRow, p: TensileProperty): { symbol: string; name: string; value: string } {
  const r = row.results.properties[p];
  const value = r.status === 'determined' ? `${r.value} ${r.unit}` : `not determined: ${r.reason}`;
  return { symbol: PROPERTY_SYMBOL[p], name: NAMES[p], value };
}

/**
 * Issues an order's test report, signed: spends the signature token (meaning "report"), numbers
 * the report, renders and keeps the PDF, records one `attached` event per reported specimen with
 * the PDF's hash and the signature, and sets the order's report date. All in one transaction.
 *
 * @throws 409 `report_blocked` when a specimen has no results; 422 `reason_required` for a
 *   second report without a reason; the signature's own refusals (403, 422).
 */
export async function issueReport(
  ctx: AppContext,
  body: ReportIssue,
  user: { id: number; role: Role; name: string; email: string },
): Promise<ReportIssued> {
  return ctx.sequelize.transaction(async (transaction) => {
    const { view, rows, results, specName } = await assemble(ctx, body.orderId, true, transaction);
    if (view.blockers.length > 0) throw conflict('report_blocked', `The report cannot be issued yet: ${view.blockers.join(' ')}`, { blockers: view.blockers });
    const previous = view.reports[0] ?? null;
    if (previous && !body.reason) {
      throw new AppError(422, 'reason_required', `${view.order.number} already has report ${previous.number}. Say why a new report replaces it.`, [
        { path: 'reason', message: 'is required for a report that replaces another' },
      ]);
    }
    const signature = await consumeSignature(ctx, body.signatureToken, { userId: user.id, expectedMeanings: ['report'] }, transaction);
    const [serial] = await ctx.sequelize.query<{ n: string }>(`SELECT nextval('test_report_serial_seq') AS n`, { type: QueryTypes.SELECT, transaction });
    const issuedAt = new Date().toISOString();
    const number = `HMR-${issuedAt.slice(0, 4)}-${String(serial?.n ?? 0).padStart(5, '0')}`;

    const included = rows.filter((r) => !(r.state in EXCLUDED_STATES));
    const specimens: ReportSpecimen[] = [];
    for (const r of included) {
      const row = results.get(String(r.item_id)) as ResultsRow;
      const measured = await effectiveEvent(ctx.sequelize, r, 'measured', transaction);
      const verdict = view.specimens.find((s) => s.code === r.code)?.verdict ?? null;
      specimens.push({
        code: r.code,
        heatNumber: r.heat_number,
        sampleCode: r.sample_code,
        geometry: getGeometry(r.geometry_key)?.label ?? r.geometry_key,
        dimensions: dimensionsOf(measured?.payload),
        s0: `${row.inputs.s0Mm2} mm² (${row.inputs.s0Basis})`,
        l0: `${row.inputs.originalGaugeLength.valueMm} mm (${row.inputs.originalGaugeLength.basis})`,
        results: REPORTED.map((p) => resultLine(row, p)),
        verdict: verdict ? VERDICT_WORDS[verdict.verdict] : 'Not judged: no specification',
        verdictLines: verdict ? verdict.properties.map((p) => p.message) : [],
        warnings: row.results.warnings.map((w) => w.message),
      });
    }
    const overall = view.verdict;
    const doc: ReportDocument = {
      number,
      issuedAt,
      order: {
        number: view.order.number,
        customerName: view.order.customerName,
        poReference: view.order.poReference,
        materialSpec: view.order.materialSpec,
        testStandard: view.order.testStandard,
      },
      specification: specName,
      overallVerdict: overall ? VERDICT_WORDS[overall] : 'Not judged',
      supersedes: previous?.number ?? null,
      reason: body.reason ?? null,
      signature: { name: user.name, email: user.email, meaning: signature.meaning, statement: SIGNATURE_MEANINGS.report, signedAt: signature.signedAt },
      specimens,
    };
    // pdf-lib and the fonts load on the first report, not with every server.
    const { renderReportPdf } = await import('./report-pdf');
    const pdf = await renderReportPdf(doc);
    const sha256 = createHash('sha256').update(pdf).digest('hex');
    const signatureRecord = { signer: signature.signer, name: user.name, meaning: signature.meaning, statement: SIGNATURE_MEANINGS.report, signedAt: signature.signedAt };
    const [inserted] = await ctx.sequelize.query<ReportRow>(
      `INSERT INTO test_reports (number, order_id, issued_at, issued_by, signature, reason, supersedes, content, pdf, pdf_sha256)
       VALUES ($1, $2, $3, $4, $5::jsonb, $6, $7, $8::jsonb, $9, $10)
       RETURNING number, order_id, issued_at, $11::text AS name, reason, supersedes, pdf_sha256, content`,
      {
        bind: [
          number,
          view.order.id,
          issuedAt,
          user.id,
          JSON.stringify(signatureRecord),
          body.reason ?? null,
          previous?.number ?? null,
          JSON.stringify({ ...doc, overallVerdict: overall, results: included.map((r) => ({ code: r.code, resultsId: Number(results.get(String(r.item_id))?.id) })) }),
          Buffer.from(pdf),
          sha256,
          user.name,
        ],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    const events: ReportIssued['events'] = [];
    for (const r of included) {
      const verdict = view.specimens.find((s) => s.code === r.code)?.verdict?.verdict ?? null;
      const recorded = await recordEvent(
        ctx,
        {
          idempotencyKey: `report:${number}:${r.code}`,
          type: 'attached',
          itemCode: r.code,
          occurredAt: issuedAt,
          payload: {
            sha256,
            category: 'test_report',
            reportNumber: number,
            order: view.order.number,
            results: Number(results.get(String(r.item_id))?.id),
            verdict,
            ...(previous ? { supersedes: previous.number } : {}),
          },
        },
        {
          actor: { kind: 'user', id: user.id, role: user.role },
          transaction,
          // The signature goes in the event's own hashed signature member, as for every signed action.
          signature: { signer: signature.signer, meaning: signature.meaning, signedAt: signature.signedAt },
        },
      );
      events.push({ item: recorded.event.item, seq: recorded.event.seq, hash: recorded.event.hash });
    }
    await ctx.sequelize.query(`UPDATE orders SET report_issued_at = $2, status = 'reported', updated_at = now() WHERE id = $1`, {
      bind: [view.order.id, issuedAt],
      transaction,
    });
    if (!inserted) throw new Error('report row was not stored');
    return { report: presentReport(inserted), events };
  });
}

/** The stored PDF of a report, byte for byte as signed. */
export async function readReportPdf(ctx: AppContext, number: string): Promise<{ pdf: Buffer; sha256: string }> {
  const [row] = await ctx.sequelize.query<{ pdf: Buffer; pdf_sha256: string }>('SELECT pdf, pdf_sha256 FROM test_reports WHERE number = $1', {
    bind: [number],
    type: QueryTypes.SELECT,
  });
  if (!row) throw notFound(`No report has the number ${number}.`);
  return { pdf: row.pdf, sha256: row.pdf_sha256 };
}
