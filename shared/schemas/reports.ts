/**
 * The reports routes: an order's results and verdicts, the specification chosen for it, and
 * issuing the signed test report.
 */
import { z } from 'zod';
import type { SpecimenVerdict, Verdict } from '../domain/tensile/specifications';
import type { PropertyResult, TensileProperty } from '../domain/tensile/compute';
import type { SpecResolution } from './results';

/** :orderId in the address. */
export const OrderIdParamsSchema = z.object({ orderId: z.coerce.number({ error: 'The order id is a positive whole number.' }).int().positive() });

/** :number in the address. */
export const ReportNumberParamsSchema = z.object({ number: z.string().trim().regex(/^HMR-\d{4}-\d{5,}$/, { error: 'A report number reads like HMR-2026-00001.' }) });

/** PUT /api/reports/orders/:orderId/specification: the specification an order is judged against. */
export const OrderSpecificationSchema = z.object({
  specKey: z.string({ error: 'Choose a specification.' }).trim().min(1, { error: 'Choose a specification.' }).max(60),
});
/** The body. */
export type OrderSpecification = z.infer<typeof OrderSpecificationSchema>;

/** POST /api/reports: issue an order's test report, signed with a signature token of meaning "report". */
export const ReportIssueSchema = z.object({
  orderId: z.coerce.number({ error: 'Choose the order.' }).int().positive(),
  signatureToken: z.string({ error: 'Sign the report first: enter your password.' }).min(10, { error: 'Sign the report first: enter your password.' }),
  /** Why a report is issued again; required once the order has a report. */
  reason: z.string().trim().min(1).max(500).optional(),
});
/** The body. */
export type ReportIssue = z.infer<typeof ReportIssueSchema>;

/** One specimen of an order with its current results and verdict. */
export interface OrderSpecimenResults {
  code: string;
  state: string;
  heatNumber: string;
  sampleCode: string;
  resultsId: number | null;
  properties: Partial<Record<TensileProperty, PropertyResult>> | null;
  verdict: SpecimenVerdict | null;
  /** Why the specimen is left out of a report, when it is (rejected, voided). */
  excluded: string | null;
}

/** A report as lists show it. */
export interface ReportView {
  number: string;
  orderId: number;
  issuedAt: string;
  issuedBy: string;
  reason: string | null;
  supersedes: string | null;
  sha256: string;
  href: string;
  verdict: Verdict | null;
}

/** GET /api/reports/orders/:orderId. */
export interface OrderResultsView {
  order: { id: number; number: string; customerName: string; poReference: string; materialSpec: string; testStandard: string; status: string; reportIssuedAt: string | null };
  specification: SpecResolution;
  specimens: OrderSpecimenResults[];
  /** Does not conform if any specimen does not, else cannot judge if any cannot, else conforms; null with no results. */
  verdict: Verdict | null;
  reports: ReportView[];
  /** What stops a report now, if anything. */
  blockers: string[];
  canIssue: boolean;
}

/** The answer of POST /api/reports. */
export interface ReportIssued {
  report: ReportView;
  events: { item: string; seq: number; hash: string }[];
}
