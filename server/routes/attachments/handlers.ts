import type { Request, Response } from 'express';
import { pipeline } from 'node:stream/promises';
import {
  attachmentTypeOf,
  AttachmentFieldsSchema,
  AttachmentHashParamsSchema,
  type AttachmentCategory,
} from '../../../shared/schemas/attachments';
import { checkFiles, readAttachments, requireStorage, storeAttachment } from '../../commands/attachments';
import { AppError, notFound, unprocessable } from '../../errors';
import { fieldIssues, parsed } from '../../middleware/validate';
import { objectKeyOf } from '../../storage/object-store';

/** POST /api/attachments (multipart): stores the file under its SHA-256; with itemCode, records an attached event. */
export async function postAttachment(req: Request, res: Response): Promise<void> {
  const file = req.received;
  if (!file || !req.actor) throw new AppError(422, 'no_file', 'Choose a file to attach (form field "file").');
  const fields = AttachmentFieldsSchema.safeParse(req.body ?? {});
  if (!fields.success) throw unprocessable('Some fields of the upload are not valid; see details.', fieldIssues(fields.error));
  const type = attachmentTypeOf(file.mediaType);
  const allowed: readonly AttachmentCategory[] = type?.categories ?? [];
  const category = fields.data.category ?? allowed[0];
  if (category === undefined || !allowed.includes(category)) {
    throw unprocessable(`A ${file.mediaType} file cannot be filed as ${category ?? 'that'}; it may be: ${allowed.join(', ')}.`, [
      { path: 'category', message: `Choose one of: ${allowed.join(', ')}.` },
    ]);
  }
  const result = await storeAttachment(req.ctx, file, { ...fields.data, category }, req.actor);
  res.status(result.created ? 201 : 200).json(result);
}

/** GET /api/attachments/:sha256/meta: what is stored under a hash. */
export async function getAttachmentMeta(req: Request, res: Response): Promise<void> {
  const { sha256 } = parsed(req, AttachmentHashParamsSchema, 'params');
  const [view] = await readAttachments(req.ctx.sequelize, [sha256]);
  if (!view) throw notFound(`No file is stored under ${sha256}.`);
  res.json(view);
}

/**
 * GET /api/attachments/:sha256: streams the file, honouring a single byte Range (206 with
 * Content-Range) so a video can seek. Content-addressed, so it may be cached for good.
 */
export async function getAttachment(req: Request, res: Response): Promise<void> {
  const { sha256 } = parsed(req, AttachmentHashParamsSchema, 'params');
  const storage = requireStorage(req.ctx);
  const [view] = await readAttachments(req.ctx.sequelize, [sha256]);
  if (!view) throw notFound(`No file is stored under ${sha256}.`);
  const rangeHeader = req.get('range');
  const range = rangeHeader && /^bytes=\d*-\d*$/.test(rangeHeader.trim()) && rangeHeader.trim() !== 'bytes=-' ? rangeHeader.trim() : undefined;
  if (range) {
    const [startText, endText] = range.slice(6).split('-');
    const start = startText === '' ? null : Number(startText);
    const end = endText === '' ? null : Number(endText);
    if ((start !== null && start >= view.size) || (start !== null && end !== null && end < start) || (start === null && end === 0)) {
      res.status(416).setHeader('Content-Range', `bytes */${view.size}`);
      throw new AppError(416, 'range_not_satisfiable', `The file is ${view.size} bytes long; the range ${range} lies outside it.`);
    }
  }
  const object = await storage.get(objectKeyOf(sha256), range);
  if (object === null) throw new AppError(410, 'file_missing', `The file ${sha256} is recorded but missing from storage. Tell the lab manager: the verifier will name it too.`);
  res.status(object.contentRange ? 206 : 200);
  res.setHeader('Content-Type', view.type);
  res.setHeader('Content-Length', String(object.contentLength));
  res.setHeader('Accept-Ranges', 'bytes');
  res.setHeader('ETag', `"${sha256}"`);
  res.setHeader('Cache-Control', 'private, max-age=31536000, immutable');
  res.setHeader('X-Content-Type-Options', 'nosniff');
  // Text and data download; pictures and video show in the page.
  const disposition = view.display === 'link' ? 'attachment' : 'inline';
  res.setHeader('Content-Disposition', `${disposition}; filename*=UTF-8''${encodeURIComponent(view.fileName)}`);
  if (object.contentRange) res.setHeader('Content-Range', object.contentRange);
  if (req.method === 'HEAD') {
    object.body.destroy();
    res.end();
    return;
  }
  await pipeline(object.body, res);
}

/** GET /api/attachments/:sha256/check: reads the stored object again and compares its SHA-256 with its name. */
export async function getAttachmentCheck(req: Request, res: Response): Promise<void> {
  const { sha256 } = parsed(req, AttachmentHashParamsSchema, 'params');
  const [view] = await readAttachments(req.ctx.sequelize, [sha256]);
  if (!view) throw notFound(`No file is stored under ${sha256}.`);
  const [check] = await checkFiles(req.ctx, [{ sha256, size: view.size }], 'rehash');
  res.json({ ...check, checkedAt: new Date().toISOString() });
}
