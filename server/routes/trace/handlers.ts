import type { Request, Response } from 'express';
import { can } from '../../../shared/permissions';
import { TraceQuerySchema } from '../../../shared/schemas/trace';
import { buildTrace } from '../../commands/trace';
import { parsed } from '../../middleware/validate';

/** A file name for a download: the code and the date. */
function packName(code: string, ext: string): string {
  return `audit-${code.replace(/[^A-Za-z0-9-]/g, '')}-${new Date().toISOString().slice(0, 10)}.${ext}`;
}

/** GET /api/items/:code/trace: genealogy, timeline, chain status, files, anomalies. */
export async function getTrace(req: Request, res: Response): Promise<void> {
  const { files } = parsed(req, TraceQuerySchema, 'query');
  const canExport = req.actor?.kind === 'user' && can(req.actor.role, 'ledger.verify');
  res.json(await buildTrace(req.ctx, String(req.params.code), { files, canExport }));
}

/** GET /api/items/:code/audit.jsonl: every event of the item and everything under it, with hashes and seals. */
export async function getAuditJsonl(req: Request, res: Response): Promise<void> {
  // The audit pack (with pdf-lib) loads on the first export, not with every server.
  const { buildAuditJsonl } = await import('../../commands/audit-pack');
  const pack = await buildAuditJsonl(req.ctx, String(req.params.code));
  res.setHeader('Content-Type', 'application/x-ndjson; charset=utf-8');
  res.setHeader('Content-Disposition', `attachment; filename="${packName(String(req.params.code), 'jsonl')}"`);
  res.setHeader('Cache-Control', 'no-store');
  res.send(pack.text);
}

/** GET /api/items/:code/audit.pdf: the audit report, verified at the moment it is made. */
export async function getAuditPdf(req: Request, res: Response): Promise<void> {
  const { buildAuditPdf } = await import('../../commands/audit-pack');
  const { bytes } = await buildAuditPdf(req.ctx, String(req.params.code));
  res.setHeader('Content-Type', 'application/pdf');
  res.setHeader('Content-Disposition', `inline; filename="${packName(String(req.params.code), 'pdf')}"`);
  res.setHeader('Cache-Control', 'no-store');
  res.send(Buffer.from(bytes));
}
