import type { Request, Response } from 'express';
import { getSpecification, SPECIFICATIONS } from '../../../shared/domain/tensile/specifications';
import { can } from '../../../shared/permissions';
import {
  SpecificationCreateSchema,
  SpecificationKeyParamsSchema,
  type SpecificationList,
  type SpecificationView,
} from '../../../shared/schemas/specifications';
import { loadAddedSpecifications } from '../../commands/results';
import { conflict, notFound } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';

async function allSpecifications(req: Request): Promise<SpecificationView[]> {
  const added = await loadAddedSpecifications(req.ctx.sequelize);
  return [
    ...SPECIFICATIONS.map((s) => ({ ...s, builtIn: true, createdAt: null, createdBy: null })),
    ...added.map((s) => ({ ...s, builtIn: false })),
  ];
}

/** GET /api/specifications: every specification, built in first, each with its source. */
export async function listSpecifications(req: Request, res: Response): Promise<void> {
  const canWrite = req.actor?.kind === 'user' && can(req.actor.role, 'specifications.write');
  const body: SpecificationList = { items: await allSpecifications(req), canWrite };
  res.json(body);
}

/** GET /api/specifications/:key. */
export async function getSpecificationByKey(req: Request, res: Response): Promise<void> {
  const { key } = parsed(req, SpecificationKeyParamsSchema, 'params');
  const found = (await allSpecifications(req)).find((s) => s.key === key);
  if (!found) throw notFound(`No specification has the key ${key}.`);
  res.json(found);
}

/** POST /api/specifications: a lab manager adds a specification; 409 when the key is taken. */
export async function addSpecification(req: Request, res: Response): Promise<void> {
  const user = currentUser(req);
  const body = parsed(req, SpecificationCreateSchema);
  if (getSpecification(body.key)) {
    throw conflict('duplicate', `${body.key} is a built-in specification; choose another key.`, [{ path: 'key', message: 'is taken by a built-in specification' }]);
  }
  const [rows] = await req.ctx.sequelize.query(
    'INSERT INTO specifications (key, body, created_by) VALUES ($1, $2::jsonb, $3) ON CONFLICT (key) DO NOTHING RETURNING key',
    { bind: [body.key, JSON.stringify(body), user.id] },
  );
  if ((rows as unknown[]).length === 0) {
    throw conflict('duplicate', `A specification with the key ${body.key} already exists.`, [{ path: 'key', message: 'is taken' }]);
  }
  const view: SpecificationView = { ...body, provenance: 'entered', builtIn: false, createdAt: new Date().toISOString(), createdBy: user.name };
  res.status(201).json(view);
}
