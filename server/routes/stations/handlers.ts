import { randomBytes } from 'node:crypto';
import type { Request, Response } from 'express';
import { Op, type WhereOptions } from 'sequelize';
import { z } from 'zod';
import { CreateInstrumentTokenSchema, CreateStationSchema, StationListQuerySchema, UpdateStationSchema } from '../../../shared/schemas/stations';
import { IdParamsSchema } from '../../../shared/schemas/users';
import { conflict, notFound } from '../../errors';
import { currentUser, hashToken } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import type { Station } from '../../models/station';
import { presentStation, presentToken } from '../../presenters/station';

/** `:id/tokens/:tokenId` in a route path. */
export const TokenParamsSchema = IdParamsSchema.extend({ tokenId: z.coerce.number().int().positive() });

/** Instrument tokens start with this, so a leaked one is easy to recognise in logs and scans. */
const TOKEN_PREFIX = 'hmi_';

async function loadStation(req: Request): Promise<Station> {
  const { id } = parsed(req, IdParamsSchema, 'params');
  const station = await req.ctx.models.Station.findByPk(id);
  if (!station) throw notFound(`No station has id ${id}.`);
  return station;
}

/** GET /api/stations: every station with how many live tokens it has. */
export async function listStations(req: Request, res: Response): Promise<void> {
  const query = parsed(req, StationListQuerySchema, 'query');
  const where: WhereOptions[] = [];
  if (query.q) {
    const like = `%${query.q.replace(/[\\%_]/g, '\\$&')}%`;
    where.push({ [Op.or]: [{ code: { [Op.iLike]: like } }, { name: { [Op.iLike]: like } }] });
  }
  if (query.active) where.push({ active: query.active === 'true' });
  const stations = await req.ctx.models.Station.findAll({ where: { [Op.and]: where }, order: [['code', 'ASC']] });
  const [counts] = await req.ctx.sequelize.query(
    'SELECT station_id, count(*)::int AS n FROM instrument_tokens WHERE revoked_at IS NULL GROUP BY station_id',
  );
  const live = new Map((counts as { station_id: number; n: number }[]).map((c) => [c.station_id, c.n]));
  res.json({ items: stations.map((s) => presentStation(s, undefined, live.get(s.id) ?? 0)) });
}

/** POST /api/stations */
export async function createStation(req: Request, res: Response): Promise<void> {
  const body = parsed(req, CreateStationSchema);
  const { Station } = req.ctx.models;
  if (await Station.findOne({ where: { code: body.code } })) {
    throw conflict('duplicate', `Station ${body.code} already exists.`, [{ path: 'code', message: 'This code is taken.' }]);
  }
  const station = await Station.create(body);
  res.status(201).json(presentStation(station, []));
}

/** GET /api/stations/:id: the station and all its tokens, live and revoked. */
export async function getStation(req: Request, res: Response): Promise<void> {
  const station = await loadStation(req);
  const tokens = await req.ctx.models.InstrumentToken.findAll({ where: { stationId: station.id }, order: [['id', 'ASC']] });
  res.json(presentStation(station, tokens));
}

/** PATCH /api/stations/:id: name, kind, active. An inactive station's tokens are refused. */
export async function updateStation(req: Request, res: Response): Promise<void> {
  const body = parsed(req, UpdateStationSchema);
  const station = await loadStation(req);
  await station.update(body);
  const tokens = await req.ctx.models.InstrumentToken.findAll({ where: { stationId: station.id }, order: [['id', 'ASC']] });
  res.json(presentStation(station, tokens));
}

/** POST /api/stations/:id/tokens: a new instrument token, shown in this answer only. */
export async function createToken(req: Request, res: Response): Promise<void> {
  const body = parsed(req, CreateInstrumentTokenSchema);
  const station = await loadStation(req);
  if (!station.active) throw conflict('station_inactive', `Station ${station.code} is inactive; activate it before giving it a token.`);
  const token = `${TOKEN_PREFIX}${randomBytes(32).toString('base64url')}`;
  const row = await req.ctx.models.InstrumentToken.create({
    stationId: station.id,
    name: body.name,
    tokenHash: hashToken(token),
    tokenPrefix: token.slice(0, TOKEN_PREFIX.length + 6),
    eventTypes: body.eventTypes,
    createdBy: currentUser(req).id,
    revokedAt: null,
    lastUsedAt: null,
  });
  res.status(201).json({ ...presentToken(row), token });
}

/** POST /api/stations/:id/tokens/:tokenId/revoke: the token stops working at once; revoking twice is harmless. */
export async function revokeToken(req: Request, res: Response): Promise<void> {
  const { id, tokenId } = parsed(req, TokenParamsSchema, 'params');
  const row = await req.ctx.models.InstrumentToken.findOne({ where: { id: tokenId, stationId: id } });
  if (!row) throw notFound(`Station ${id} has no token with id ${tokenId}.`);
  if (!row.revokedAt) await row.update({ revokedAt: new Date() });
  res.json(presentToken(row));
}
