/**
 * Disposal and return batches: each scanned code judged (retention date, holds, state, the same
 * item twice, another order's or customer's item), then, with a single-use signature, one
 * `disposed` or `returned` event per item and the batch's document, all in one transaction.
 * A batch with any refused line records nothing.
 */
import { createHash } from 'node:crypto';
import { QueryTypes, type Transaction } from 'sequelize';
import { parseCode } from '../../shared/domain/codes';
import { localDateOf } from '../../shared/domain/retention';
import { SIGNATURE_MEANINGS } from '../../shared/schemas/auth';
import type { BatchCheck, BatchCheckView, BatchCreate, BatchKind, BatchLine, BatchSummary, BatchView } from '../../shared/schemas/disposals';
import { ROLE_LABELS } from '../../shared/permissions';
import type { AppContext } from '../app';
import { consumeSignature } from '../auth/signatures';
import { AppError, notFound } from '../errors';
import { isRecorded, type LedgerActor } from '../ledger/types';
import { recordEvents, refusalError } from './record-event';
import type { DocumentItem } from './disposal-document';
import { containerPaths, judgeItem, loadActiveHolds, loadItemsByCode, loadLabSettings, type LabSettings, type RetainedItem } from './retention';

/** The judged batch: a line per scanned code, and the items that may go, in scan order. */
export interface JudgedBatch {
  view: BatchCheckView;
  items: { item: RetainedItem; location: string }[];
  settings: LabSettings;
}

/**
 * Judges each scanned code for a batch of this kind. A disposal needs every item past its
 * dispose-not-before date; a return hands the customer's items back whenever they ask, so
 * only holds and the item's state stand in its way. Both refuse a code scanned twice, an item
 * of another order (when the batch names one), and, for a return, another customer's item.
 */
export async function judgeBatch(
  ctx: AppContext,
  body: BatchCheck,
  opts: { now: Date; transaction?: Transaction; lock?: boolean },
): Promise<JudgedBatch> {
  const parsedCodes = body.codes.map((scanned) => ({ scanned, parsed: parseCode(scanned) }));
  const wanted = parsedCodes.flatMap(({ parsed }) => (parsed.ok && (parsed.kind === 'specimen' || parsed.kind === 'half') ? [parsed.code] : []));
  const [settings, items, holds, where] = await Promise.all([
    loadLabSettings(ctx, opts.transaction),
    loadItemsByCode(ctx, [...new Set(wanted)], { transaction: opts.transaction, lock: opts.lock }),
    loadActiveHolds(ctx, opts.transaction),
    containerPaths(ctx, opts.transaction),
  ]);
  const seen = new Set<string>();
  let customerId: number | null = null;
  const lines: BatchLine[] = [];
  const accepted: JudgedBatch['items'] = [];
  for (const { scanned, parsed } of parsedCodes) {
    if (!parsed.ok) {
      lines.push({ scanned, code: null, ok: false, status: 'invalid', message: parsed.message });
      continue;
    }
    if (parsed.kind !== 'specimen' && parsed.kind !== 'half') {
      const message = `${parsed.code} is a ${parsed.kind} code; scan the specimens and halves themselves.`;
      lines.push({ scanned, code: parsed.code, ok: false, status: 'invalid', message });
      continue;
    }
    if (seen.has(parsed.code)) {
      lines.push({ scanned, code: parsed.code, ok: false, status: 'duplicate', message: `${parsed.code} was already scanned into this batch; it counts once.` });
      continue;
    }
    seen.add(parsed.code);
    const item = items.get(parsed.code);
    if (!item) {
      lines.push({ scanned, code: parsed.code, ok: false, status: 'unknown', message: `No specimen or half has the code ${parsed.code}.` });
      continue;
    }
    const location = where(item.containerId);
    const facts = { kind: item.kind, specimen: item.specimen, order: item.order, customer: item.customer, heat: item.heat, location };
    if (body.orderNumber && item.order.toLowerCase() !== body.orderNumber.toLowerCase()) {
      lines.push({
        scanned, code: item.code, ok: false, status: 'other_order', ...facts,
        message: `${item.code} belongs to order ${item.order}, not ${body.orderNumber}; this batch is for order ${body.orderNumber} only.`,
      });
      continue;
    }
    if (body.kind === 'return') {
      customerId ??= item.customerId;
      if (item.customerId !== customerId) {
        const first = accepted[0]?.item.customer ?? 'another customer';
        lines.push({
          scanned, code: item.code, ok: false, status: 'other_customer', ...facts,
          message: `${item.code} belongs to ${item.customer}; a return goes to one customer (${first}).`,
        });
        continue;
      }
    }
    const check = judgeItem(item, holds, settings, opts.now);
    const firstDay = check.status === 'may_go' || check.status === 'not_due' ? (check.due?.firstDay ?? null) : null;
    const ok = check.status === 'may_go' || (body.kind === 'return' && check.status === 'not_due');
    const message = ok && check.status === 'not_due' ? `${item.code} may be returned to ${item.customer} (its retention has not ended).` : check.message;
    lines.push({ scanned, code: item.code, ok, status: ok ? 'may_go' : check.status, message, ...facts, firstDay });
    if (ok) accepted.push({ item, location });
  }
  return { view: { ok: lines.every((l) => l.ok), kind: body.kind, lines }, items: accepted, settings };
}

const MEANING: Record<BatchKind, 'disposal' | 'return'> = { disposal: 'disposal', return: 'return' };
const EVENT: Record<BatchKind, 'disposed' | 'returned'> = { disposal: 'disposed', return: 'returned' };

interface BatchRow {
  id: number;
  number: string;
  kind: BatchKind;
  order_number: string | null;
  customer_name: string | null;
  signer_id: number;
  signer_name: string;
  signer_email: string;
  meaning: string;
  statement: string;
  signed_at: Date;
  recorded_at: Date;
  recipient: string | null;
  note: string | null;
  document_sha256: string;
}

const BATCH_FROM = `
    FROM disposal_batches b JOIN users u ON u.id = b.signer_id
    LEFT JOIN orders o ON o.id = b.order_id LEFT JOIN customers c ON c.id = b.customer_id`;

const BATCH_SELECT = `
  SELECT b.id, b.number, b.kind, o.number AS order_number, c.name AS customer_name, b.signer_id, u.name AS signer_name,
         u.email AS signer_email, b.meaning, b.statement, b.signed_at, b.recorded_at, b.recipient, b.note, b.document_sha256${BATCH_FROM}`;

/** A batch row as the API shows it, without its items: one shape for the batch page and the list. */
function presentBatch(row: BatchRow): Omit<BatchView, 'items'> {
  return {
    id: row.id,
    number: row.number,
    kind: row.kind,
    order: row.order_number,
    customer: row.customer_name,
    signer: { id: row.signer_id, name: row.signer_name, email: row.signer_email },
    meaning: row.meaning,
    statement: row.statement,
    signedAt: new Date(row.signed_at).toISOString(),
    recordedAt: new Date(row.recorded_at).toISOString(),
    recipient: row.recipient,
    note: row.note,
    documentSha256: row.document_sha256,
    documentUrl: `/api/disposals/${encodeURIComponent(row.number)}/document.pdf`,
  };
}

/** A batch as the API shows it, by its number. */
export async function readBatch(ctx: AppContext, number: string, transaction?: Transaction): Promise<BatchView> {
  const [row] = await ctx.sequelize.query<BatchRow>(`${BATCH_SELECT} WHERE b.number = $1`, { bind: [number], type: QueryTypes.SELECT, transaction });
  if (!row) throw notFound(`No disposal or return batch has the number ${number}.`);
  const items = await ctx.sequelize.query<{ code: string; kind: string; specimen_code: string | null; order_number: string; heat_number: string; event_hash: string }>(
    'SELECT code, kind, specimen_code, order_number, heat_number, event_hash FROM disposal_batch_items WHERE batch_id = $1 ORDER BY position',
    { bind: [row.id], type: QueryTypes.SELECT, transaction },
  );
  return {
    ...presentBatch(row),
    items: items.map((i) => ({ code: i.code, kind: i.kind, specimen: i.specimen_code, order: i.order_number, heat: i.heat_number, eventHash: i.event_hash })),
  };
}

/** Batches, newest first, paged. */
export async function listBatches(
  ctx: AppContext,
  query: { kind?: BatchKind; q?: string; sort: string; page: number; pageSize: number },
): Promise<{ items: BatchSummary[]; total: number }> {
  const where: string[] = [];
  const bind: unknown[] = [];
  if (query.kind) {
    bind.push(query.kind);
    where.push(`b.kind = $${bind.length}`);
  }
  if (query.q) {
    bind.push(`%${query.q.replace(/[\\%_]/g, (m) => `\\${m}`)}%`);
    where.push(`(b.number ILIKE $${bind.length} OR o.number ILIKE $${bind.length} OR c.name ILIKE $${bind.length}
      OR EXISTS (SELECT 1 FROM disposal_batch_items x WHERE x.batch_id = b.id AND x.code ILIKE $${bind.length}))`);
  }
  const clause = where.length ? `WHERE ${where.join(' AND ')}` : '';
  const order = `${query.sort.replace(/^-/, '') === 'number' ? 'b.number' : 'b.recorded_at'} ${query.sort.startsWith('-') ? 'DESC' : 'ASC'}, b.id`;
  const [count] = await ctx.sequelize.query<{ n: number }>(`SELECT count(*)::integer AS n ${BATCH_FROM} ${clause}`, { bind, type: QueryTypes.SELECT });
  const rows = await ctx.sequelize.query<BatchRow & { item_count: number }>(
    `${BATCH_SELECT.replace('b.document_sha256', 'b.document_sha256, b.item_count')} ${clause} ORDER BY ${order} LIMIT $${bind.length + 1} OFFSET $${bind.length + 2}`,
    { bind: [...bind, query.pageSize, (query.page - 1) * query.pageSize], type: QueryTypes.SELECT },
  );
  return {
    total: count?.n ?? 0,
    items: rows.map((row) => ({ ...presentBatch(row), itemCount: row.item_count })),
  };
}

/** The stored document of a batch. */
export async function readBatchDocument(ctx: AppContext, number: string): Promise<{ bytes: Buffer; kind: BatchKind; sha256: string }> {
  const [row] = await ctx.sequelize.query<{ document: Buffer; kind: BatchKind; document_sha256: string }>(
    'SELECT document, kind, document_sha256 FROM disposal_batches WHERE number = $1',
    { bind: [number], type: QueryTypes.SELECT },
  );
  if (!row) throw notFound(`No disposal or return batch has the number ${number}.`);
  return { bytes: row.document, kind: row.kind, sha256: row.document_sha256 };
}

/**
 * Records a signed batch. Answers, in this order: 422 `signature_required` without a token;
 * 409 `batch_refused` with a line per code when any may not go (nothing recorded, the signature
 * left unspent); the signature's own refusals (403 someone else's, 422 used, expired or of
 * another meaning); then one event per item, the document and the batch rows, committed together.
 */
export async function createBatch(ctx: AppContext, body: BatchCreate, actor: LedgerActor & { kind: 'user' }, now = new Date()): Promise<BatchView> {
  if (!body.signatureToken) {
    throw new AppError(
      422,
      'signature_required',
      `A ${body.kind} batch needs a signature: sign with your password (meaning "${MEANING[body.kind]}"), then send the signature token.`,
      [{ path: 'signatureToken', message: `is required for a ${body.kind}` }],
    );
  }
  const token = body.signatureToken;
  const number = await ctx.sequelize.transaction(async (transaction) => {
    const judged = await judgeBatch(ctx, body, { now, transaction, lock: true });
    if (!judged.view.ok) {
      const refusedLines = judged.view.lines.filter((l) => !l.ok);
      throw new AppError(
        409,
        'batch_refused',
        `${refusedLines.length} of ${judged.view.lines.length} scanned item${judged.view.lines.length === 1 ? '' : 's'} may not go in this ${body.kind}; nothing was recorded. ${refusedLines[0]?.message ?? ''}`.trim(),
        judged.view,
      );
    }
    const signature = await consumeSignature(ctx, token, { userId: actor.id, expectedMeanings: [MEANING[body.kind]] }, transaction);
    const [serial] = await ctx.sequelize.query<{ n: string }>(`SELECT nextval('disposal_batch_seq') AS n`, { type: QueryTypes.SELECT, transaction });
    const year = localDateOf(now, judged.settings.timeZone).slice(0, 4);
    const batchNumber = `${body.kind === 'disposal' ? 'D' : 'R'}-${year}-${String(serial?.n ?? '0').padStart(5, '0')}`;
    const occurredAt = now.toISOString();
    const outcomes = await recordEvents(
      ctx,
      judged.items.map(({ item }) => ({
        idempotencyKey: `${batchNumber}:${item.code}`,
        type: EVENT[body.kind],
        itemCode: item.code,
        occurredAt,
        payload: {
          batch: batchNumber,
          ...(body.recipient ? { recipient: body.recipient } : {}),
        },
      })),
      // The signature goes in the event's own hashed signature member, as for every signed action.
      { actor, transaction, signature: { signer: signature.signer, meaning: signature.meaning, signedAt: signature.signedAt } },
    );
    const refusedOutcome = outcomes.find((o) => !isRecorded(o));
    if (refusedOutcome && !isRecorded(refusedOutcome)) throw refusalError(refusedOutcome);

    const [signer] = await ctx.sequelize.query<{ name: string; email: string; role: keyof typeof ROLE_LABELS }>('SELECT name, email, role FROM users WHERE id = $1', {
      bind: [signature.signer],
      type: QueryTypes.SELECT,
      transaction,
    });
    const first = judged.items[0]?.item;
    const oneOrder = judged.items.every(({ item }) => item.orderId === first?.orderId);
    const oneCustomer = judged.items.every(({ item }) => item.customerId === first?.customerId);
    const docItems: DocumentItem[] = judged.items.map(({ item, location }, i) => {
      const outcome = outcomes[i];
      return {
        code: item.code,
        kind: item.kind,
        specimen: item.specimen,
        heat: item.heat,
        order: item.order,
        customer: item.customer,
        location,
        eventHash: outcome && isRecorded(outcome) ? outcome.event.hash : '',
      };
    });
    const statement = SIGNATURE_MEANINGS[signature.meaning];
    // pdf-lib and the fonts load on the first document, not with every server.
    const { renderBatchDocument } = await import('./disposal-document');
    const bytes = await renderBatchDocument({
      number: batchNumber,
      kind: body.kind,
      signer: { name: signer?.name ?? `user ${signature.signer}`, email: signer?.email ?? '', role: signer ? ROLE_LABELS[signer.role] : '' },
      meaning: signature.meaning,
      statement,
      signedAt: signature.signedAt,
      recordedAt: occurredAt,
      timeZone: judged.settings.timeZone,
      order: oneOrder ? (first?.order ?? null) : null,
      customer: oneCustomer ? (first?.customer ?? null) : null,
      recipient: body.recipient ?? null,
      note: body.note ?? null,
      items: docItems,
    });
    const digest = createHash('sha256').update(bytes).digest('hex');
    const [batch] = await ctx.sequelize.query<{ id: number }>(
      `INSERT INTO disposal_batches (number, kind, order_id, customer_id, signer_id, meaning, statement, signed_at, recorded_at, item_count,
                                     recipient, note, document_sha256, document)
       VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9, $10, $11, $12, $13, $14) RETURNING id`,
      {
        bind: [
          batchNumber, body.kind, oneOrder ? (first?.orderId ?? null) : null, oneCustomer ? (first?.customerId ?? null) : null,
          signature.signer, signature.meaning, statement, signature.signedAt, occurredAt, docItems.length,
          body.recipient ?? null, body.note ?? null, digest, Buffer.from(bytes),
        ],
        type: QueryTypes.SELECT,
        transaction,
      },
    );
    for (const [position, { item }] of judged.items.entries()) {
      const d = docItems[position] as DocumentItem;
      await ctx.sequelize.query(
        `INSERT INTO disposal_batch_items (batch_id, position, item_id, code, kind, specimen_code, order_number, heat_number, event_hash)
         VALUES ($1, $2, $3, $4, $5, $6, $7, $8, $9)`,
        { bind: [batch?.id, position + 1, item.id, item.code, item.kind, item.specimen, item.order, item.heat, d.eventHash], transaction },
      );
    }
    return batchNumber;
  });
  return readBatch(ctx, number);
}
