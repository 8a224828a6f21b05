import type { Transporter } from 'nodemailer';
import type { Config } from '../config';
import type { StandInSmtp, StoredMail } from './stand-in';

// nodemailer and the stand-in's SMTP server load with the first message: most requests send none.
const loadNodemailer = async () => (await import('nodemailer')).default;
const loadStandIn = () => import('./stand-in');

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
    const smtp = { host: config.SMTP_HOST, port: config.SMTP_PORT, secure: config.SMTP_SECURE };
    const auth = config.SMTP_USER ? { user: config.SMTP_USER, pass: config.SMTP_PASS ?? '' } : undefined;
    let transport: Promise<Transporter> | null = null;
    const dir = config.SMTP_OUTBOX_DIR;
    return {
      send: async (mail) => {
        transport ??= loadNodemailer().then((nodemailer) => nodemailer.createTransport({ ...smtp, auth }));
        await (await transport).sendMail({ from, ...mail });
      },
      outbox: dir ? async () => (await loadStandIn()).readMailFolder(dir) : null,
      close: async () => {
        if (transport) (await transport).close();
      },
    };
  }
  let standIn: Promise<StandInSmtp> | null = null;
  let transport: Transporter | null = null;
  const ready = async (): Promise<{ server: StandInSmtp; transport: Transporter }> => {
    standIn ??= loadStandIn().then(({ startStandInSmtp }) => startStandInSmtp());
    const server = await standIn;
    const nodemailer = await loadNodemailer();
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
