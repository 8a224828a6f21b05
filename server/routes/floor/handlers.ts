import type { Request, Response } from 'express';
import { QueryTypes } from 'sequelize';
import type { FloorView } from '../../../shared/schemas/floor';

// Pieces at rest or gone are not work in progress at a station.
const NOT_IN_WORK = ['retained', 'disposed', 'returned', 'broken', 'none'];

/** GET /api/floor: how many items are in each state, and the queue at each station with its oldest wait. */
export async function getFloor(req: Request, res: Response): Promise<void> {
  const q = <T extends object>(sql: string, bind: unknown[] = []) => req.ctx.sequelize.query<T>(sql, { bind, type: QueryTypes.SELECT });
  const [states, stations, events] = await Promise.all([
    q<FloorView['states'][number]>(`SELECT kind, state, count(*)::int AS count FROM items GROUP BY kind, state ORDER BY kind, count DESC`),
    q<FloorView['stations'][number]>(
      `SELECT s.code, s.name, s.kind, count(i.id)::int AS count,
              to_char(min(i.last_event_at) AT TIME ZONE 'UTC', 'YYYY-MM-DD"T"HH24:MI:SS.MS"Z"') AS "oldestSince"
         FROM stations s
         LEFT JOIN items i ON i.station_id = s.id AND i.kind <> 'container' AND NOT (i.state = ANY($1::text[]))
        WHERE s.active
        GROUP BY s.id ORDER BY s.code`,
      [NOT_IN_WORK],
    ),
    q<{ n: number }>(`SELECT count(*)::int AS n FROM custody_events WHERE recorded_at > now() - interval '24 hours'`),
  ]);
  const view: FloorView = { states, stations, eventsLast24h: events[0]?.n ?? 0 };
  res.json(view);
}
