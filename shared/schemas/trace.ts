/**
 * Trace, lab-wide anomalies and search: the query schemas and the shapes the API answers with,
 * so the client reads the same types the server builds.
 */
import { z } from 'zod';
import { ANOMALY_CODES, ANOMALY_SEVERITIES, type Anomaly } from '../domain/anomalies';
import type { ChainBreak } from '../domain/ledger/event-hash';
import type { AttachmentView, FileCheck } from './attachments';

/** GET /api/items/:code/trace: `files=rehash` reads every attached file again and hashes it. */
export const TraceQuerySchema = z.object({
  files: z.enum(['presence', 'rehash'], { error: 'files is presence or rehash.' }).default('presence'),
});
export type TraceQuery = z.infer<typeof TraceQuerySchema>;

/** How a piece relates to the item traced. */
export type TraceRole = 'self' | 'specimen' | 'half' | 'content';

/** Who recorded an event, in words. */
export interface TraceActor {
  kind: 'user' | 'instrument';
  id: number;
  name: string;
  /** A person's role, or the station an instrument is bound to. */
  role: string | null;
}

/** One event of the timeline. */
export interface TraceEvent {
  item: string;
  seq: number;
  type: string;
  actor: TraceActor;
  station: string | null;
  stationName: string | null;
  container: string | null;
  occurredAt: string;
  recordedAt: string;
  payload: Record<string, unknown>;
  signature: { signer: number; signerName: string; meaning: string; signedAt: string } | null;
  corrects: string | null;
  /** A later void cancelled this event; it stays in the ledger. */
  cancelled: boolean;
  hash: string;
  prevHash: string;
}

/** One item's chain, checked. */
export interface TraceChain {
  item: string;
  kind: string;
  role: TraceRole;
  ok: boolean;
  events: number;
  headSeq: number;
  headHash: string | null;
  firstBreak: ChainBreak | null;
}

/** Where things come from: order → heat → sample → specimen → halves, and where the item sits. */
export interface TraceGenealogy {
  customer: { id: number; name: string } | null;
  order: { id: number; number: string; poReference: string; materialSpec: string; testStandard: string } | null;
  heat: { id: number; heatNumber: string; material: string; grade: string; producer: string; certificateRef: string | null } | null;
  sample: { id: number; code: string; position: string; orientation: string; thicknessMm: string | null } | null;
  specimen: { code: string; state: string; geometryKey: string; testStandard: string } | null;
  halves: { code: string; side: 'A' | 'B'; state: string }[];
  /** Containers around the item now, innermost first. */
  containers: { code: string; containerType: string; name: string; state: string }[];
  /** For a container: what is in it now (at most 500). */
  contents: { code: string; kind: string; state: string }[];
}

/** An anomaly with the item it was found on. */
export type TraceAnomaly = Anomaly & { item: string };

/** An attachment cited by an `attached` event, with that event. */
export type TraceAttachment = AttachmentView & { item: string; seq: number; occurredAt: string; note: string | null };

/** GET /api/items/:code/trace. */
export interface TraceView {
  item: { code: string; kind: string; state: string; stateLabel: string };
  location: { station: { code: string; name: string } | null; text: string };
  genealogy: TraceGenealogy;
  events: TraceEvent[];
  chains: TraceChain[];
  chainOk: boolean;
  files: { mode: 'presence' | 'rehash'; ok: boolean; checks: FileCheck[] };
  attachments: TraceAttachment[];
  anomalies: TraceAnomaly[];
  verifiedAt: string;
  /** Whether the caller may download the audit pack. */
  canExport: boolean;
}

/**
 * GET /api/anomalies: paged, optionally one severity or one code. `refresh=full` judges every
 * item again before answering, instead of only those whose judgement may be out of date.
 */
export const AnomalyListQuerySchema = z.object({
  page: z.coerce.number().int().min(1).default(1),
  pageSize: z.coerce.number().int().min(1).max(200).default(50),
  severity: z.enum(ANOMALY_SEVERITIES as readonly ['info', 'warning', 'critical'], { error: 'severity is info, warning or critical.' }).optional(),
  code: z.enum(ANOMALY_CODES, { error: `code is one of: ${ANOMALY_CODES.join(', ')}.` }).optional(),
  refresh: z.enum(['full'], { error: 'refresh is full (or left out).' }).optional(),
});
export type AnomalyListQuery = z.infer<typeof AnomalyListQuerySchema>;

/** One row of the lab-wide list. */
export type LabAnomaly = TraceAnomaly & { kind: string; state: string };

/** GET /api/anomalies answer. */
export interface AnomalyPage {
  items: LabAnomaly[];
  total: number;
  page: number;
  pageSize: number;
  /** Count per severity over the whole lab (not just this page). */
  counts: Record<'info' | 'warning' | 'critical', number>;
  itemsChecked: number;
  checkedAt: string;
}

/** GET /api/search?q=. */
export const SearchQuerySchema = z.object({
  q: z.string({ error: 'Type something to search for.' }).trim().min(2, 'Type at least two characters.').max(100, 'Keep the search under 100 characters.'),
  limit: z.coerce.number().int().min(1).max(100).default(25),
});
export type SearchQuery = z.infer<typeof SearchQuerySchema>;

/** What a search hit is. */
export const SEARCH_KINDS = ['specimen', 'half', 'container', 'sample', 'heat', 'order'] as const;
export type SearchKind = (typeof SEARCH_KINDS)[number];

/** One search hit; `code` is set for things that have a trace. */
export interface SearchHit {
  kind: SearchKind;
  id: number;
  /** The text that matched, as stored (a code, a heat number, an order number or a PO reference). */
  label: string;
  /** What else to show: the customer, the heat's producer, the order's PO. */
  detail: string;
  /** Which field matched: code, heat number, order number, PO reference. */
  matched: 'code' | 'heat_number' | 'order_number' | 'po_reference' | 'sample_code';
  code: string | null;
  state: string | null;
}

/** GET /api/search answer. */
export interface SearchResult {
  q: string;
  hits: SearchHit[];
}
