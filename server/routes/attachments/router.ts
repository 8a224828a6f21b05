import { Router } from 'express';
import { AttachmentHashParamsSchema } from '../../../shared/schemas/attachments';
import { authorize } from '../../middleware/auth';
import { validate } from '../../middleware/validate';
import { getAttachment, getAttachmentCheck, getAttachmentMeta, postAttachment } from './handlers';
import { attachmentUpload } from './upload';

/** Files attached to items: upload (streamed and hashed), read back by hash, re-hash check. */
export function attachmentsRouter(): Router {
  const router = Router();
  router.post('/', authorize('events.record'), attachmentUpload(), postAttachment);
  router.get('/:sha256', authorize('lab.read'), validate(AttachmentHashParamsSchema, 'params'), getAttachment);
  router.get('/:sha256/meta', authorize('lab.read'), validate(AttachmentHashParamsSchema, 'params'), getAttachmentMeta);
  router.get('/:sha256/check', authorize('ledger.verify'), validate(AttachmentHashParamsSchema, 'params'), getAttachmentCheck);
  return router;
}
