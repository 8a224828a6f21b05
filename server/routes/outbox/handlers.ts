import type { Request, Response } from 'express';
import type { OutboxMessageView } from '../../../shared/schemas/auth';
import { notFound } from '../../errors';
import type { StoredMail } from '../../mail/stand-in';

async function view(mail: StoredMail): Promise<OutboxMessageView> {
  // mailparser is only needed where the stand-in runs, so it is loaded on demand.
  const { simpleParser } = await import('mailparser');
  const parsed = await simpleParser(mail.raw);
  return { id: mail.id, receivedAt: mail.receivedAt, from: mail.from, to: mail.to, subject: parsed.subject ?? '', text: parsed.text ?? '' };
}

/** GET /api/outbox: what the stand-in SMTP server received, newest first; 404 when real SMTP is in use. */
export async function listOutbox(req: Request, res: Response): Promise<void> {
  const read = req.ctx.mailer.outbox;
  if (!read) throw notFound('The outbox exists only while the stand-in SMTP server is in use; mail goes to the configured SMTP server.');
  const mails = (await read()).slice(-200).reverse();
  res.json({ items: await Promise.all(mails.map(view)) });
}
