import type { Request, Response } from 'express';
import { QueryTypes } from 'sequelize';
import { randomUUID } from 'node:crypto';
import { parseCode } from '../../../shared/domain/codes';
import { PutAwaySchema, type PutAwayOutcome, type StoreNode, type StoreTreeView } from '../../../shared/schemas/retention';
import { recordEvents } from '../../commands/record-event';
import { judgeRetainedItems } from '../../commands/retention';
import { isRecorded } from '../../ledger/types';
import { unauthorized, unprocessable } from '../../errors';
import { parsed } from '../../middleware/validate';

interface ContainerRow {
  id: string;
  code: string;
  name: string;
  container_type: string;
  state: string;
  container_id: string | null;
}

interface PieceRow {
  code: string;
  kind: 'specimen' | 'half';
  state: string;
  container_id: string;
  order_number: string | null;
  heat_number: string | null;
}

/** GET /api/store/tree: what is where, shelf by shelf, with each piece's retention verdict. */
export async function getStoreTree(req: Request, res: Response): Promise<void> {
  const q = <T extends object>(sql: string) => req.ctx.sequelize.query<T>(sql, { type: QueryTypes.SELECT });
  const [containers, pieces, judged] = await Promise.all([
    q<ContainerRow>(`SELECT i.id, i.code, c.name, c.container_type, i.state, i.container_id
                       FROM items i JOIN containers c ON c.item_id = i.id WHERE i.state <> 'disposed' ORDER BY c.serial`),
    q<PieceRow>(`SELECT i.code, i.kind, i.state, i.container_id, o.number AS order_number, h.heat_number
                   FROM items i
                   LEFT JOIN specimens s ON s.item_id = CASE WHEN i.kind = 'half' THEN i.parent_item_id ELSE i.id END
                   LEFT JOIN samples sa ON sa.id = s.sample_id LEFT JOIN orders o ON o.id = sa.order_id LEFT JOIN heats h ON h.id = sa.heat_id
                  WHERE i.kind IN ('specimen','half') AND i.container_id IS NOT NULL ORDER BY i.code`),
    judgeRetainedItems(req.ctx, new Date()),
  ]);
  const verdicts = new Map(judged.items.map((i) => [i.code, i]));
  const nodes = new Map<string, StoreNode & { parent: string | null }>();
  for (const c of containers) {
    nodes.set(c.id, { code: c.code, name: c.name, containerType: c.container_type, state: c.state, items: [], children: [], total: 0, parent: c.container_id });
  }
  for (const p of pieces) {
    const verdict = verdicts.get(p.code);
    nodes.get(p.container_id)?.items.push({
      code: p.code,
      kind: p.kind,
      state: p.state,
      order: p.order_number,
      heat: p.heat_number,
      status: verdict?.status ?? null,
      firstDay: verdict?.firstDay ?? null,
    });
  }
  const roots: StoreNode[] = [];
  const bins: StoreNode[] = [];
  for (const node of nodes.values()) {
    const parent = node.parent === null ? undefined : nodes.get(node.parent);
    if (parent) parent.children.push(node);
    else if (node.containerType === 'bin') bins.push(node);
    else roots.push(node);
  }
  const total = (node: StoreNode, depth = 0): number => {
    node.total = node.items.length + (depth > 64 ? 0 : node.children.reduce((sum, child) => sum + total(child, depth + 1), 0));
    return node.total;
  };
  const strip = (node: StoreNode & { parent?: string | null }): StoreNode => {
    const { parent: _parent, ...rest } = node;
    return { ...rest, children: rest.children.map(strip) };
  };
  for (const node of [...roots, ...bins]) total(node);
  // Shelves first, then loose boxes, bags and carts.
  const rank: Record<string, number> = { shelf: 0, box: 1, bag: 2, cart: 3 };
  roots.sort((a, b) => (rank[a.containerType] ?? 9) - (rank[b.containerType] ?? 9) || a.name.localeCompare(b.name));
  const body: StoreTreeView = { roots: roots.map(strip), bins: bins.map(strip).filter((b) => b.total > 0), timeZone: judged.settings.timeZone };
  res.json(body);
}

/**
 * POST /api/store/put-away: each scanned code goes into the container through the ledger; a
 * piece from a bin (or a rejected specimen) is `retained`, a piece already in storage and any
 * container is `moved` (what a bag or box holds goes with it). Each code is judged alone.
 */
export async function postPutAway(req: Request, res: Response): Promise<void> {
  const body = parsed(req, PutAwaySchema);
  if (!req.actor) throw unauthorized();
  const into = parseCode(body.into);
  if (!into.ok) throw unprocessable(into.message, [{ path: 'into', message: into.message }]);
  if (into.kind !== 'container') throw unprocessable(`${into.code} is a ${into.kind} code; scan the bag, box or shelf first.`, [{ path: 'into', message: 'is not a container' }]);
  const codes = body.codes.map((c) => {
    const p = parseCode(c);
    return p.ok ? p.code : c;
  });
  const rows = await req.ctx.sequelize.query<{ code: string; kind: string; state: string }>('SELECT code, kind, state FROM items WHERE code = ANY($1)', {
    bind: [codes],
    type: QueryTypes.SELECT,
  });
  const known = new Map(rows.map((r) => [r.code, r]));
  const typeFor = (code: string): 'retained' | 'moved' => {
    const row = known.get(code);
    if (!row) return 'retained';
    if (row.kind === 'container' || row.state === 'retained') return 'moved';
    return 'retained';
  };
  const occurredAt = new Date().toISOString();
  const outcomes = await recordEvents(
    req.ctx,
    codes.map((code) => ({
      idempotencyKey: randomUUID(),
      type: typeFor(code),
      itemCode: code,
      containerCode: into.code,
      stationCode: body.stationCode,
      occurredAt,
      payload: {},
    })),
    { actor: req.actor },
  );
  const result: PutAwayOutcome[] = outcomes.map((o, i) => {
    const code = codes[i] ?? '';
    if (isRecorded(o)) {
      return { code: o.item.code, ok: true, type: o.event.type as 'retained' | 'moved', message: `${o.item.code} ${o.event.type} into ${into.code}.` };
    }
    return { code, ok: false, type: null, message: o.error.message };
  });
  res.json({ into: into.code, outcomes: result, recorded: result.filter((r) => r.ok).length });
}
