import nodemailer, { type Transporter } from 'nodemailer';
import type { Config } from '../config';
import { readMailFolder, startStandInSmtp, type StandInSmtp, type StoredMail } from './stand-in';

/** One message to send. */
export interface OutgoingMail {
  to: string;
  subject: string;
  text: string;
  html?: string;
}

/** Sends mail; when a stand-in SMTP server is in use, also reads what it kept. */
export interface Mailer {
  send: (mail: OutgoingMail) => Promise<void>;
  /** The stand-in's messages, or null when mail goes to a real SMTP server. */
  outbox: (() => Promise<StoredMail[]>) | null;
  close: () => Promise<void>;
}

/**
 * The mailer for one app context. With SMTP_HOST set, nodemailer sends there (and, when
 * SMTP_OUTBOX_DIR is set, `npm start`'s stand-in keeps its copies in that folder). Without it,
 * a stand-in SMTP server starts on loopback at the first message, in memory.
 */
export function createMailer(config: Config): Mailer {
  const from = config.SMTP_FROM;
  if (config.SMTP_HOST) {
    const transport: Transporter = nodemailer.createTransport({
      host: config.SMTP_HOST,
      port: config.SMTP_PORT,
      secure: config.SMTP_SECURE,
      auth: config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASS ?? '' } : undefined,
    });
    const dir = config.SMTP_OUTBOX_DIR;
    return {
      send: async (mail) => {
        await transport.sendMail({ from, ...mail });
      },
      outbox: dir ? async () => readMailFolder(dir) : null,
      close: async () => transport.close(),
    };
  }
  let standIn: Promise<StandInSmtp> | null = null;
  let transport: Transporter | null = null;
  const ready = async (): Promise<{ server: StandInSmtp; transport: Transporter }> => {
    standIn ??= startStandInSmtp();
    const server = await standIn;
    transport ??= nodemailer.createTransport({ host: server.host, port: server.port, secure: false, ignoreTLS: true });
    return { server, transport };
  };
  return {
    send: async (mail) => {
      const { transport: t } = await ready();
      await t.sendMail({ from, ...mail });
    },
    outbox: async () => (await ready()).server.messages(),
    close: async () => {
      transport?.close();
      if (standIn) await (await standIn).close();
    },
  };
}
