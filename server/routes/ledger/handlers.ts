import type { Request, Response } from 'express';
import { loadSeals } from '../../commands/seal-day';
import { verifyLedger } from '../../commands/verify-ledger';

/** GET /api/ledger/verify: recomputes every chain and seal; names the first break. */
export async function getVerify(req: Request, res: Response): Promise<void> {
  res.json(await verifyLedger(req.ctx.sequelize));
}

/** GET /api/ledger/seals: the daily seals, oldest first. */
export async function getSeals(req: Request, res: Response): Promise<void> {
  const seals = await loadSeals(req.ctx.sequelize);
  res.json({ seals: seals.map(({ seal }) => ({ day: seal.day, heads: seal.heads.length, prevSeal: seal.prevSeal, hash: seal.hash })) });
}
