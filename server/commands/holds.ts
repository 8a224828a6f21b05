/** Legal holds: placing one on an order, a heat or an item, and releasing it with a signature. */
import { QueryTypes } from 'sequelize';
import { parseCode } from '../../shared/domain/codes';
import type { HoldCreate, HoldRelease, HoldView } from '../../shared/schemas/holds';
import type { AppContext } from '../app';
import { consumeSignature } from '../auth/signatures';
import { AppError, conflict, notFound, unprocessable } from '../errors';
import { activeHoldOf, holdsCovering, loadRetainedItems, type HoldRowCore } from './retention';

interface HoldRow extends HoldRowCore {
  placed_by: number;
  placed_by_name: string;
  released_at: Date | null;
  released_by: number | null;
  released_by_name: string | null;
  release_reason: string | null;
}

const HOLD_SELECT = `
  SELECT h.id, h.scope, h.order_id, h.heat_id, h.item_id, h.ref, h.reason, h.placed_at, h.placed_by, p.name AS placed_by_name,
         h.released_at, h.released_by, r.name AS released_by_name, h.release_reason
    FROM legal_holds h JOIN users p ON p.id = h.placed_by LEFT JOIN users r ON r.id = h.released_by`;

/** Lists holds, newest first, each with how many retained items it covers. */
export async function listHolds(ctx: AppContext, filter: { active?: boolean; scope?: HoldView['scope'] } = {}): Promise<HoldView[]> {
  const where: string[] = [];
  const bind: unknown[] = [];
  if (filter.active !== undefined) where.push(filter.active ? 'h.released_at IS NULL' : 'h.released_at IS NOT NULL');
  if (filter.scope) {
    bind.push(filter.scope);
    where.push(`h.scope = $${bind.length}`);
  }
  const rows = await ctx.sequelize.query<HoldRow>(`${HOLD_SELECT} ${where.length ? `WHERE ${where.join(' AND ')}` : ''} ORDER BY h.id DESC LIMIT 500`, {
    bind,
    type: QueryTypes.SELECT,
  });
  const retained = await loadRetainedItems(ctx);
  return rows.map((row) => {
    const active = activeHoldOf(row);
    return {
      id: row.id,
      scope: row.scope,
      ref: row.ref,
      reason: row.reason,
      placedAt: active.placedAt,
      placedBy: { id: row.placed_by, name: row.placed_by_name },
      releasedAt: row.released_at === null ? null : new Date(row.released_at).toISOString(),
      releasedBy: row.released_by === null ? null : { id: row.released_by, name: row.released_by_name ?? '' },
      releaseReason: row.release_reason,
      items: retained.filter((item) => holdsCovering(item, [active]).length > 0).length,
    };
  });
}

async function holdView(ctx: AppContext, id: number): Promise<HoldView> {
  const all = await listHolds(ctx);
  const found = all.find((h) => h.id === id);
  if (!found) throw notFound(`No hold has the id ${id}.`);
  return found;
}

async function resolveTarget(ctx: AppContext, body: HoldCreate): Promise<{ column: 'order_id' | 'heat_id' | 'item_id'; id: number; ref: string }> {
  const q = <T extends object>(sql: string, bind: unknown[]) => ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
  if (body.scope === 'order') {
    const [order] = await q<{ id: number; number: string }>('SELECT id, number FROM orders WHERE lower(number) = lower($1)', [body.ref]);
    if (!order) throw unprocessable(`No order has the number ${body.ref}.`, [{ path: 'ref', message: 'is not an order number' }]);
    return { column: 'order_id', id: order.id, ref: order.number };
  }
  if (body.scope === 'heat') {
    const heats = await q<{ id: number; heat_number: string; producer: string }>(
      `SELECT id, heat_number, producer FROM heats WHERE lower(heat_number) = lower($1) ${body.heatId ? 'AND id = $2' : ''} ORDER BY id`,
      body.heatId ? [body.ref, body.heatId] : [body.ref],
    );
    if (heats.length === 0) throw unprocessable(`No heat has the number ${body.ref}.`, [{ path: 'ref', message: 'is not a heat number' }]);
    if (heats.length > 1) {
      throw conflict('heat_ambiguous', `${heats.length} producers use the heat number ${body.ref}; send heatId to say which.`, {
        heats: heats.map((h) => ({ id: h.id, heatNumber: h.heat_number, producer: h.producer })),
      });
    }
    const heat = heats[0] as { id: number; heat_number: string; producer: string };
    return { column: 'heat_id', id: heat.id, ref: `${heat.heat_number} (${heat.producer})` };
  }
  const code = parseCode(body.ref);
  if (!code.ok) throw unprocessable(code.message, [{ path: 'ref', message: code.message }]);
  if (code.kind !== 'specimen' && code.kind !== 'half') {
    throw unprocessable(`${code.code} is a ${code.kind} code; hold a specimen or a half (or its order or heat).`, [{ path: 'ref', message: 'is not a specimen or half' }]);
  }
  const [item] = await q<{ id: string; code: string }>('SELECT id, code FROM items WHERE code = $1', [code.code]);
  if (!item) throw unprocessable(`No item has the code ${code.code}.`, [{ path: 'ref', message: 'is not a registered item' }]);
  return { column: 'item_id', id: Number(item.id), ref: item.code };
}

/** Places a hold. The same thing may be held twice for two reasons; each needs its own release. */
export async function placeHold(ctx: AppContext, body: HoldCreate, userId: number): Promise<HoldView> {
  const target = await resolveTarget(ctx, body);
  const [row] = await ctx.sequelize.query<{ id: number }>(
    `INSERT INTO legal_holds (scope, ${target.column}, ref, reason, placed_by) VALUES ($1, $2, $3, $4, $5) RETURNING id`,
    { bind: [body.scope, target.id, target.ref, body.reason, userId], type: QueryTypes.SELECT },
  );
  return holdView(ctx, Number(row?.id));
}

/**
 * Releases a hold with a signature meaning "hold-release": the signature is spent and the
 * release stored in one transaction. 409 when it was already released.
 */
export async function releaseHold(ctx: AppContext, id: number, body: HoldRelease, userId: number): Promise<HoldView> {
  if (!body.signatureToken) {
    throw new AppError(422, 'signature_required', 'Releasing a hold needs a signature: sign with your password (meaning "hold-release"), then send the signature token.', [
      { path: 'signatureToken', message: 'is required to release a hold' },
    ]);
  }
  const token = body.signatureToken;
  await ctx.sequelize.transaction(async (transaction) => {
    const [hold] = await ctx.sequelize.query<{ id: number; released_at: Date | null }>('SELECT id, released_at FROM legal_holds WHERE id = $1 FOR UPDATE', {
      bind: [id],
      type: QueryTypes.SELECT,
      transaction,
    });
    if (!hold) throw notFound(`No hold has the id ${id}.`);
    if (hold.released_at !== null) throw conflict('already_released', `Hold ${id} was already released on ${new Date(hold.released_at).toISOString()}.`);
    const signature = await consumeSignature(ctx, token, { userId, expectedMeanings: ['hold-release'] }, transaction);
    await ctx.sequelize.query(
      `UPDATE legal_holds SET released_at = now(), released_by = $2, release_reason = $3, release_signature = $4::jsonb WHERE id = $1`,
      { bind: [id, userId, body.reason, JSON.stringify(signature)], transaction },
    );
  });
  return holdView(ctx, id);
}
