import type { Request, Response } from 'express';
import { lastMigration } from '../../schema-version';

const HEALTH_TIMEOUT_MS = 3_000;

/** 200 with the last applied migration, or 503 with ok:false when the database does not answer. */
export async function getHealth(req: Request, res: Response): Promise<void> {
  try {
    const migration = await Promise.race([
      lastMigration(req.ctx.sequelize),
      new Promise<never>((_, reject) => setTimeout(() => reject(new Error('timeout')), HEALTH_TIMEOUT_MS).unref()),
    ]);
    res.json({ ok: true, db: 'up', migration });
  } catch {
    res.status(503).json({
      ok: false,
      db: 'down',
      migration: null,
      error: { code: 'db_unavailable', message: 'The database is not answering; the lab cannot record scans until it is back.' },
    });
  }
}
