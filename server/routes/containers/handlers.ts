import type { Request, Response } from 'express';
import { QueryTypes } from 'sequelize';
import { ContainerCreateSchema, ContainerListQuerySchema } from '../../../shared/schemas/containers';
import { registerContainer } from '../../commands/register-container';
import { notFound, unauthorized, unprocessable } from '../../errors';
import { codeFromParam, containerChain } from '../../ledger/items';
import { parsed } from '../../middleware/validate';

interface ContainerRow {
  id: string;
  code: string;
  containerType: string;
  name: string;
  binHalf: 'A' | 'B' | null;
  state: string;
  containerId: string | null;
  station: string | null;
  contents: number;
  createdAt: string;
}

const CONTAINER_SELECT = `
  SELECT i.id, i.code, c.container_type AS "containerType", c.name, c.bin_half AS "binHalf", i.state,
         i.container_id AS "containerId", s.code AS station,
         (SELECT count(*)::integer FROM items x WHERE x.container_id = i.id) AS contents,
         to_char(c.created_at AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "createdAt"
    FROM items i JOIN containers c ON c.item_id = i.id LEFT JOIN stations s ON s.id = i.station_id`;

async function containerDetail(req: Request, code: string) {
  const [row] = await req.ctx.sequelize.query<ContainerRow>(`${CONTAINER_SELECT} WHERE i.code = $1`, {
    bind: [code],
    type: QueryTypes.SELECT,
  });
  if (!row) throw notFound(`No container has the code ${code}.`);
  const id = Number(row.id);
  const contents = await req.ctx.sequelize.query<{ code: string; kind: string; state: string }>(
    'SELECT code, kind, state FROM items WHERE container_id = $1 ORDER BY kind, code LIMIT 1000',
    { bind: [id], type: QueryTypes.SELECT },
  );
  const location = await containerChain(req.ctx.sequelize, row.containerId === null ? null : Number(row.containerId));
  const { containerId: _omit, ...rest } = row;
  return { ...rest, id, location, items: contents };
}

/**
 * POST /api/containers: registers a container and records its `registered` event (through the
 * same command the demo lab uses); a repeated idempotency key answers the container it made.
 */
export async function createContainer(req: Request, res: Response): Promise<void> {
  const body = parsed(req, ContainerCreateSchema);
  if (!req.actor) throw unauthorized();
  if (body.idempotencyKey) {
    const [seen] = await req.ctx.sequelize.query<{ item_code: string }>(
      `SELECT item_code FROM custody_events WHERE idempotency_key = $1 AND type = 'registered'`,
      { bind: [body.idempotencyKey], type: QueryTypes.SELECT },
    );
    if (seen) {
      res.status(200).json({ container: await containerDetail(req, seen.item_code), replayed: true });
      return;
    }
  }
  const code = await registerContainer(req.ctx, body, { actor: req.actor });
  res.status(201).json({ container: await containerDetail(req, code), replayed: false });
}

/** GET /api/containers: search, filter by type and state, page. */
export async function listContainers(req: Request, res: Response): Promise<void> {
  const query = parsed(req, ContainerListQuerySchema, 'query');
  const where: string[] = [];
  const bind: unknown[] = [];
  if (query.q) {
    bind.push(`%${query.q.replace(/[\\%_]/g, (m) => `\\${m}`)}%`);
    where.push(`(i.code ILIKE $${bind.length} OR c.name ILIKE $${bind.length})`);
  }
  if (query.type) {
    bind.push(query.type);
    where.push(`c.container_type = $${bind.length}`);
  }
  if (query.state) {
    bind.push(query.state);
    where.push(`i.state = $${bind.length}`);
  }
  const clause = where.length > 0 ? `WHERE ${where.join(' AND ')}` : '';
  const [count] = await req.ctx.sequelize.query<{ n: number }>(
    `SELECT count(*)::integer AS n FROM items i JOIN containers c ON c.item_id = i.id ${clause}`,
    { bind, type: QueryTypes.SELECT },
  );
  const rows = await req.ctx.sequelize.query<ContainerRow>(
    `${CONTAINER_SELECT} ${clause} ORDER BY c.serial LIMIT $${bind.length + 1} OFFSET $${bind.length + 2}`,
    { bind: [...bind, query.pageSize, (query.page - 1) * query.pageSize], type: QueryTypes.SELECT },
  );
  res.json({
    items: rows.map(({ containerId: _omit, ...row }) => ({ ...row, id: Number(row.id) })),
    total: count?.n ?? 0,
    page: query.page,
    pageSize: query.pageSize,
  });
}

/** GET /api/containers/:code: one container, where it is and what it holds. */
export async function getContainer(req: Request, res: Response): Promise<void> {
  const parsedCode = codeFromParam(String(req.params.code));
  if (parsedCode.kind !== 'container') throw unprocessable(`${parsedCode.code} is a ${parsedCode.kind} code, not a container code.`);
  res.json(await containerDetail(req, parsedCode.code));
}
