import { randomUUID } from 'node:crypto';
import type { NextFunction, Request, Response } from 'express';
import { QueryTypes, type Transaction } from 'sequelize';
import { LabelError } from '../../../labels/errors';
import type { RenderRequest } from '../../../labels/render';
import { listStocks, type Stock } from '../../../labels/stocks';
import type { BadgeLabel, BagLabel, ContainerLabel, HalfLabel, LabelKind, SpecimenLabel } from '../../../labels/layouts';
import { parseCode } from '../../../shared/domain/codes';
import { allowedNext, type ItemKind } from '../../../shared/domain/ledger/state-machine';
import { getGeometry } from '../../../shared/domain/specimen-geometries';
import { can, ROLE_LABELS, type Role } from '../../../shared/permissions';
import {
  CODE_KIND_FOR_LABEL,
  LABEL_HEADERS,
  LabelPrintSchema,
  MAX_LABELS_PER_REQUEST,
  tooManyLabelsMessage,
  type LabelPrint,
  type LabelPrintKind,
  type LabelStocksResponse,
  type LabelStockView,
} from '../../../shared/schemas/labels';
import { recordEvents, refusalError } from '../../commands/record-event';
import { isRecorded } from '../../ledger/types';
import { AppError, conflict, forbidden, type FieldIssue } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';

// The API's kinds and the renderer's kinds must stay the same list; this fails to compile otherwise.
const SAME_KINDS: [LabelPrintKind, LabelKind] extends [LabelKind, LabelPrintKind] ? true : never = true;
void SAME_KINDS;

function stockView(stock: Stock): LabelStockView {
  return {
    key: stock.key,
    name: stock.name,
    kind: stock.kind,
    columns: stock.columns,
    rows: stock.rows,
    positionsPerPage: stock.columns * stock.rows,
    labelWidthMm: stock.labelWidthMm,
    labelHeightMm: stock.labelHeightMm,
    pageWidthMm: stock.pageWidthMm,
    pageHeightMm: stock.pageHeightMm,
  };
}

/** GET /api/labels/stocks: the rolls and sheets labels print on, in the order to offer them. */
export function listLabelStocks(_req: Request, res: Response): void {
  const body: LabelStocksResponse = { stocks: listStocks().map(stockView), maxLabels: MAX_LABELS_PER_REQUEST };
  res.json(body);
}

/**
 * Refuses a request for more labels than one PDF may hold before the body is validated code by
 * code: 413 with the count, so 10,000 codes cost one length check, not 10,000 parses.
 */
export function refuseTooManyLabels(req: Request, _res: Response, next: NextFunction): void {
  const codes: unknown = (req.body as { codes?: unknown } | undefined)?.codes;
  if (Array.isArray(codes) && codes.length > MAX_LABELS_PER_REQUEST) {
    throw new AppError(413, 'too_many_labels', tooManyLabelsMessage(codes.length), {
      max: MAX_LABELS_PER_REQUEST,
      received: codes.length,
    });
  }
  next();
}

function unknownStock(key: string): AppError {
  const keys = listStocks().map((s) => s.key);
  return new AppError(422, 'unknown_stock', `There is no label stock "${key}". Choose one of: ${keys.join(', ')}.`, [
    { path: 'stock', message: `Choose one of: ${keys.join(', ')}.` },
  ]);
}

/** Maps the renderer's refusal to the API's error shape, naming the code of the label at fault. */
function labelErrorToAppError(error: LabelError, codes: readonly string[], body: LabelPrint): AppError {
  const code = error.code.replace(/-/g, '_');
  switch (error.code) {
    case 'unknown-stock':
      return unknownStock(body.stock);
    case 'too-many-labels':
      return new AppError(413, code, error.message, { max: MAX_LABELS_PER_REQUEST, received: codes.length });
    case 'bad-start-position':
      return new AppError(422, code, error.message, [{ path: 'startPosition', message: error.message }]);
    case 'no-labels':
      return new AppError(422, code, error.message, [{ path: 'codes', message: error.message }]);
    default: {
      const index = error.labelIndex;
      const which = index === undefined ? undefined : codes[index];
      const message = which === undefined ? error.message : `${which}: ${error.message}`;
      return new AppError(422, code, message, index === undefined ? undefined : [{ path: `codes.${index}`, message }]);
    }
  }
}

const listed = (codes: readonly string[]): string => (codes.length <= 5 ? codes.join(', ') : `${codes.slice(0, 5).join(', ')} and ${codes.length - 5} more`);

/**
 * Parses every code and checks it is of the kind the label prints; refuses the whole request with
 * 422 naming each bad code. Returns the display forms, in the order given.
 */
function parseCodes(kind: LabelPrintKind, raw: readonly string[]): string[] {
  const want = CODE_KIND_FOR_LABEL[kind];
  const issues: (FieldIssue & { code: string; reason: string })[] = [];
  const codes = raw.map((text, i) => {
    const result = parseCode(text);
    if (!result.ok) {
      const reason = result.reason === 'check' ? 'check_character' : 'invalid_code';
      issues.push({ path: `codes.${i}`, message: `${text}: ${result.message}`, code: text, reason });
      return text;
    }
    if (result.kind !== want) {
      issues.push({
        path: `codes.${i}`,
        message: `${result.code} is a ${result.kind} code; ${kind} labels are printed for ${want} codes.`,
        code: result.code,
        reason: 'wrong_kind',
      });
    }
    return result.code;
  });
  if (issues.length === 0) return codes;
  const reasons = new Set(issues.map((i) => i.reason));
  const errorCode = reasons.size === 1 ? (issues[0] as (typeof issues)[number]).reason : 'invalid_codes';
  const message =
    issues.length === 1
      ? (issues[0] as (typeof issues)[number]).message
      : `${issues.length} codes cannot be printed: ${listed(issues.map((i) => i.code))}. See details.`;
  throw new AppError(422, errorCode, message, issues.map(({ path, message: m }) => ({ path, message: m })));
}

/** One item or badge a label is printed for, with its label data. */
interface Resolved {
  /** The items row id; null for badges, which are people, not ledger items. */
  itemId: number | null;
  itemKind: ItemKind | null;
  state: string | null;
  label: SpecimenLabel | HalfLabel | BagLabel | ContainerLabel | BadgeLabel;
}

interface PieceRow {
  id: string;
  code: string;
  state: string;
  heat_number: string;
  order_number: string;
  geometry_key: string;
  specimen_code: string;
}

interface ContainerRow {
  id: string;
  code: string;
  state: string;
  container_type: string;
  name: string;
}

interface BadgeRow {
  code: string;
  name: string;
  role: Role;
  active: boolean;
}

const TYPE_NAMES: Record<string, string> = { bin: 'Bin', bag: 'Bag', box: 'Box', shelf: 'Shelf', cart: 'Cart' };

async function select<T extends object>(req: Request, sql: string, bind: unknown[], transaction?: Transaction): Promise<T[]> {
  return req.ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT, transaction });
}

/** Looks every code up; 404 naming those that name nothing. Badges of deactivated people are refused. */
async function resolveCodes(req: Request, kind: LabelPrintKind, codes: readonly string[]): Promise<Map<string, Resolved>> {
  const distinct = [...new Set(codes)];
  const found = new Map<string, Resolved>();
  if (kind === 'specimen' || kind === 'half') {
    // A half's heat and order are its specimen's: join through the parent item.
    const rows = await select<PieceRow>(
      req,
      `SELECT i.id, i.code, i.state, h.heat_number, o.number AS order_number, sp.geometry_key, p.code AS specimen_code
         FROM items i
         JOIN items p ON p.id = ${kind === 'half' ? 'i.parent_item_id' : 'i.id'}
         JOIN specimens sp ON sp.item_id = p.id
         JOIN samples s ON s.id = sp.sample_id
         JOIN heats h ON h.id = s.heat_id
         JOIN orders o ON o.id = s.order_id
        WHERE i.code = ANY($1::text[]) AND i.kind = $2`,
      [distinct, kind],
    );
    for (const r of rows) {
      const label: SpecimenLabel | HalfLabel =
        kind === 'specimen'
          ? { code: r.code, heat: r.heat_number, order: r.order_number, ...specimenLine(r.geometry_key) }
          : { code: r.code, specimenCode: r.specimen_code, heat: r.heat_number, order: r.order_number };
      found.set(r.code, { itemId: Number(r.id), itemKind: kind, state: r.state, label });
    }
  } else if (kind === 'bag' || kind === 'container') {
    const rows = await select<ContainerRow>(
      req,
      `SELECT i.id, i.code, i.state, c.container_type, c.name
         FROM items i JOIN containers c ON c.item_id = i.id
        WHERE i.code = ANY($1::text[]) AND i.kind = 'container'`,
      [distinct],
    );
    for (const r of rows) {
      const type = TYPE_NAMES[r.container_type] ?? r.container_type;
      const label: BagLabel | ContainerLabel =
        kind === 'bag' ? { code: r.code, title: r.name, lines: [type] } : { code: r.code, containerType: type, name: r.name };
      found.set(r.code, { itemId: Number(r.id), itemKind: 'container', state: r.state, label });
    }
  } else {
    const rows = await select<BadgeRow>(req, `SELECT badge_code AS code, name, role, active FROM users WHERE badge_code = ANY($1::text[])`, [distinct]);
    const inactive = rows.filter((r) => !r.active).map((r) => r.code);
    if (inactive.length > 0) {
      throw conflict('user_inactive', `Badges are not printed for deactivated people: ${listed(inactive)}.`, {
        codes: inactive,
      });
    }
    for (const r of rows) {
      found.set(r.code, { itemId: null, itemKind: null, state: null, label: { code: r.code, name: r.name, role: ROLE_LABELS[r.role] ?? r.role } });
    }
  }
  const missing = codes.flatMap((code, i) => (found.has(code) ? [] : [{ path: `codes.${i}`, message: `No ${kind === 'badge' ? 'person has the badge' : 'item has the code'} ${code}.` }]));
  if (missing.length > 0) {
    const names = [...new Set(missing.map((m) => codes[Number(m.path.slice(6))] as string))];
    const what = kind === 'badge' ? 'badge' : 'item';
    throw new AppError(
      404,
      'not_found',
      names.length === 1
        ? `No ${what} has the code ${names[0]}. Check the label, or register the ${what} first.`
        : `${names.length} codes name no ${what}: ${listed(names)}.`,
      missing,
    );
  }
  return found;
}

function specimenLine(geometryKey: string): { specimenLine?: string } {
  const label = getGeometry(geometryKey)?.label;
  return label === undefined ? {} : { specimenLine: label };
}

/** Items whose state allows no label print (disposed, returned, voided, sent away …): 409 naming them. */
function checkStates(codes: readonly string[], found: ReadonlyMap<string, Resolved>): void {
  const refused = [...new Set(codes)].flatMap((code) => {
    const r = found.get(code);
    if (r === undefined || r.itemKind === null || r.state === null) return [];
    return allowedNext(r.itemKind, r.state as Parameters<typeof allowedNext>[1]).includes('label_printed') ? [] : [{ code, state: r.state }];
  });
  if (refused.length === 0) return;
  const first = refused[0] as { code: string; state: string };
  throw conflict(
    'state_refused',
    refused.length === 1
      ? `${first.code} is ${first.state.replace(/_/g, ' ')}: no label is printed for it in that state.`
      : `${refused.length} items are in a state that takes no label: ${listed(refused.map((r) => `${r.code} (${r.state.replace(/_/g, ' ')})`))}.`,
    refused.map((r) => ({ path: `codes.${codes.indexOf(r.code)}`, message: `${r.code} is ${r.state.replace(/_/g, ' ')}.`, state: r.state })),
  );
}

/** Item ids (of those given) that already have a label_printed event. */
async function printedBefore(req: Request, itemIds: readonly number[], transaction?: Transaction): Promise<Set<number>> {
  if (itemIds.length === 0) return new Set();
  const rows = await select<{ item_id: string }>(
    req,
    `SELECT DISTINCT item_id FROM custody_events WHERE type = 'label_printed' AND item_id = ANY($1::bigint[])`,
    [itemIds],
    transaction,
  );
  return new Set(rows.map((r) => Number(r.item_id)));
}

/** 422 when any item was printed before and the request gives no reason. */
function requireReason(body: LabelPrint, codes: readonly string[], found: ReadonlyMap<string, Resolved>, printed: ReadonlySet<number>): void {
  if (body.reprint !== undefined || printed.size === 0) return;
  const again = [...new Set(codes)].filter((code) => printed.has(found.get(code)?.itemId ?? -1));
  const message = `${again.length === 1 ? `${again[0]} has` : `${again.length} items have`} had a label printed before: say why the label is printed again.`;
  throw new AppError(422, 'reprint_reason_required', message, [
    { path: 'reprint.reason', message: 'Say why the labels are printed again (worn, lost, smudged …).' },
    ...again.map((code) => ({ path: `codes.${codes.indexOf(code)}`, message: `${code} was printed before.` })),
  ]);
}

/**
 * POST /api/labels: resolves every code, renders the whole PDF, and only then records one
 * `label_printed` event per item in one transaction, so a refusal leaves neither a PDF nor an
 * event. Badge cards are printed without ledger events: people are not ledger items.
 */
export async function printLabels(req: Request, res: Response): Promise<void> {
  const body = parsed(req, LabelPrintSchema);
  const actor = currentUser(req);
  if (body.kind === 'badge' && !can(actor.role, 'users.write')) {
    throw forbidden('Badge cards are printed by people who manage users (a lab manager).', { action: 'users.write', role: actor.role });
  }
  const stock = listStocks().find((s) => s.key === body.stock);
  if (stock === undefined) throw unknownStock(body.stock);

  const codes = parseCodes(body.kind, body.codes);
  const found = await resolveCodes(req, body.kind, codes);
  checkStates(codes, found);
  const itemIds = [...new Set([...found.values()].flatMap((r) => (r.itemId === null ? [] : [r.itemId])))];
  requireReason(body, codes, found, await printedBefore(req, itemIds));

  let pdf: Uint8Array;
  try {
    // The renderer (bwip-js, pdf-lib, fonts) loads on the first print, not with every server.
    const { renderLabelsPdf } = await import('../../../labels/render');
    pdf = await renderLabelsPdf({
      kind: body.kind,
      stock: stock.key,
      labels: codes.map((code) => (found.get(code) as Resolved).label),
      startPosition: body.startPosition,
    } as RenderRequest);
  } catch (error) {
    if (error instanceof LabelError) throw labelErrorToAppError(error, codes, body);
    throw error;
  }

  const reprinted = itemIds.length === 0 ? [] : await recordPrints(req, body, codes, found, itemIds);

  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `inline; filename="halfmark-${body.kind}-labels-${stock.key}.pdf"`);
  res.setHeader('Cache-Control', 'no-store');
  res.setHeader(LABEL_HEADERS.labels, String(codes.length));
  res.setHeader(LABEL_HEADERS.events, String(itemIds.length));
  if (reprinted.length > 0) res.setHeader(LABEL_HEADERS.reprinted, reprinted.join(','));
  res.status(200).end(Buffer.from(pdf.buffer, pdf.byteOffset, pdf.byteLength));
}

/**
 * Records one label_printed event per item through the ledger, all in one transaction: the item
 * rows are locked first and "printed before" is judged again under the lock, so two people
 * printing the same label at once cannot both record a first print. Returns the reprinted codes.
 */
async function recordPrints(
  req: Request,
  body: LabelPrint,
  codes: readonly string[],
  found: ReadonlyMap<string, Resolved>,
  itemIds: readonly number[],
): Promise<string[]> {
  const actor = currentUser(req);
  const copies = new Map<string, number>();
  for (const code of codes) copies.set(code, (copies.get(code) ?? 0) + 1);
  return req.ctx.sequelize.transaction(async (transaction) => {
    await select(req, `SELECT id FROM items WHERE id = ANY($1::bigint[]) ORDER BY id FOR NO KEY UPDATE`, [itemIds], transaction);
    const printed = await printedBefore(req, itemIds, transaction);
    requireReason(body, codes, found, printed);
    const occurredAt = new Date().toISOString();
    const reprinted: string[] = [];
    const inputs = [...copies].map(([code, count]) => {
      const item = found.get(code) as Resolved;
      const reprint = printed.has(item.itemId ?? -1);
      if (reprint) reprinted.push(code);
      return {
        idempotencyKey: randomUUID(),
        type: 'label_printed' as const,
        itemCode: code,
        occurredAt,
        payload: {
          kind: body.kind,
          stock: body.stock,
          reprint,
          ...(reprint && body.reprint ? { reason: body.reprint.reason } : {}),
          ...(count > 1 ? { copies: count } : {}),
        },
      };
    });
    const outcomes = await recordEvents(req.ctx, inputs, { actor: { kind: 'user', id: actor.id, role: actor.role }, transaction });
    const refusal = outcomes.find((o) => !isRecorded(o));
    if (refusal !== undefined && !isRecorded(refusal)) throw refusalError(refusal);
    return reprinted;
  });
}
