import type { Request, Response } from 'express';
import { can } from '../../../shared/permissions';
import { RecordUploadQuerySchema, ResultsEntrySchema } from '../../../shared/schemas/results';
import { buildSpecimenResults, computeSpecimenResults, uploadRawRecord } from '../../commands/results';
import { AppError } from '../../errors';
import { currentUser } from '../../middleware/auth';
import { parsed } from '../../middleware/validate';

function codeParam(req: Request): string {
  return String(req.params.code ?? '');
}

/** GET /api/results/specimens/:code: inputs, current results, chart, verdict, history. */
export async function getSpecimenResults(req: Request, res: Response): Promise<void> {
  const canWrite = req.actor?.kind === 'user' && can(req.actor.role, 'results.write');
  res.json(await buildSpecimenResults(req.ctx, codeParam(req), canWrite));
}

/** POST /api/results/specimens/:code: computes and stores results; answers the new view (201). */
export async function saveSpecimenResults(req: Request, res: Response): Promise<void> {
  const user = currentUser(req);
  await computeSpecimenResults(req.ctx, codeParam(req), parsed(req, ResultsEntrySchema), user.id);
  res.status(201).json(await buildSpecimenResults(req.ctx, codeParam(req), true));
}

/** POST /api/results/specimens/:code/records: keeps a raw record whose columns map (201). */
export async function uploadRecord(req: Request, res: Response): Promise<void> {
  const user = currentUser(req);
  if (typeof req.body !== 'string') {
    throw new AppError(415, 'not_csv', 'Send the record as the request body with Content-Type text/csv, and name its columns in the address.');
  }
  const record = await uploadRawRecord(req.ctx, codeParam(req), req.body, parsed(req, RecordUploadQuerySchema, 'query'), user.id);
  res.status(201).json({ rawRecord: record });
}
