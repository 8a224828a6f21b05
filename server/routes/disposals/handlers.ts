import type { Request, Response } from 'express';
import { BatchCheckSchema, BatchCreateSchema, BatchListQuerySchema } from '../../../shared/schemas/disposals';
import { createBatch, judgeBatch, listBatches, readBatch, readBatchDocument } from '../../commands/disposal-batch';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';
import { can } from '../../../shared/permissions';

/** POST /api/disposals/check: each scanned code's verdict for a batch, without recording anything. */
export async function postCheck(req: Request, res: Response): Promise<void> {
  const body = parsed(req, BatchCheckSchema);
  const judged = await judgeBatch(req.ctx, body, { now: new Date() });
  res.json(judged.view);
}

/** POST /api/disposals: a signed disposal or return batch; 201 with the batch and its document's address. */
export async function postBatch(req: Request, res: Response): Promise<void> {
  const body = parsed(req, BatchCreateSchema);
  const user = currentUser(req);
  const batch = await createBatch(req.ctx, body, { kind: 'user', id: user.id, role: user.role });
  res.status(201).location(batch.documentUrl).json(batch);
}

/** GET /api/disposals: batches, newest first. */
export async function getBatches(req: Request, res: Response): Promise<void> {
  const query = parsed(req, BatchListQuerySchema, 'query');
  const { items, total } = await listBatches(req.ctx, query);
  res.json({
    items,
    total,
    page: query.page,
    pageSize: query.pageSize,
    canWrite: req.actor?.kind === 'user' && can(req.actor.role, 'disposals.write'),
  });
}

/** GET /api/disposals/:number: one batch with its items. */
export async function getBatch(req: Request, res: Response): Promise<void> {
  res.json(await readBatch(req.ctx, String(req.params.number)));
}

/** GET /api/disposals/:number/document.pdf: the certificate or transfer form, as signed. */
export async function getBatchDocument(req: Request, res: Response): Promise<void> {
  const number = String(req.params.number);
  const doc = await readBatchDocument(req.ctx, number);
  const name = `${doc.kind === 'disposal' ? 'disposal-certificate' : 'transfer-form'}-${number}.pdf`;
  res
    .status(200)
    .type('application/pdf')
    .setHeader('Content-Disposition', `inline; filename="${name}"`)
    .setHeader('X-Document-SHA256', doc.sha256)
    .send(doc.bytes);
}
