import { randomUUID } from 'node:crypto';
import { mkdirSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import type { AddressInfo } from 'node:net';
import path from 'node:path';
import { SMTPServer } from 'smtp-server';

/** A message as the stand-in received it: the SMTP envelope and the raw RFC 5322 source. */
export interface StoredMail {
  id: string;
  receivedAt: string;
  from: string;
  to: string[];
  raw: string;
}

/** A running stand-in SMTP server on loopback. */
export interface StandInSmtp {
  host: string;
  port: number;
  /** Every message received, oldest first. */
  messages: () => StoredMail[];
  close: () => Promise<void>;
}

/** Reads the messages a stand-in kept in a folder, oldest first. */
export function readMailFolder(dir: string): StoredMail[] {
  let names: string[];
  try {
    names = readdirSync(dir).filter((n) => n.endsWith('.json'));
  } catch {
    return [];
  }
  return names
    .map((n) => JSON.parse(readFileSync(path.join(dir, n), 'utf8')) as StoredMail)
    .sort((a, b) => a.receivedAt.localeCompare(b.receivedAt) || a.id.localeCompare(b.id));
}

/**
 * Starts an SMTP server on 127.0.0.1 that accepts any message and keeps it, in memory and, when
 * `dir` is given, as one JSON file per message (so `npm start` keeps mail across restarts).
 * For development and tests only: it delivers nothing anywhere.
 */
export async function startStandInSmtp(opts: { port?: number; dir?: string } = {}): Promise<StandInSmtp> {
  const kept: StoredMail[] = opts.dir ? readMailFolder(opts.dir) : [];
  if (opts.dir) mkdirSync(opts.dir, { recursive: true });
  const server = new SMTPServer({
    authOptional: true,
    disabledCommands: ['STARTTLS'],
    // Loopback only: asking DNS who 127.0.0.1 is can only delay the greeting.
    disableReverseLookup: true,
    logger: false,
    banner: 'Halfmark stand-in SMTP (keeps mail, delivers nothing)',
    onAuth: (_auth, _session, cb) => cb(null, { user: 'stand-in' }),
    onData(stream, session, cb) {
      const chunks: Buffer[] = [];
      stream.on('data', (c: Buffer) => chunks.push(c));
      stream.on('end', () => {
        const mail: StoredMail = {
          id: `${Date.now().toString(36)}-${randomUUID().slice(0, 8)}`,
          receivedAt: new Date().toISOString(),
          from: session.envelope.mailFrom ? session.envelope.mailFrom.address : '',
          to: session.envelope.rcptTo.map((r) => r.address),
          raw: Buffer.concat(chunks).toString('utf8'),
        };
        kept.push(mail);
        if (opts.dir) writeFileSync(path.join(opts.dir, `${mail.id}.json`), JSON.stringify(mail), { mode: 0o600 });
        cb();
      });
    },
  });
  const net = await new Promise<import('node:net').Server>((resolve, reject) => {
    const s = server.listen(opts.port ?? 0, '127.0.0.1', () => resolve(s));
    s.once('error', reject);
  });
  // The stand-in must never keep a test process or a stopping server alive on its own.
  net.unref();
  const port = (net.address() as AddressInfo).port;
  return {
    host: '127.0.0.1',
    port,
    messages: () => [...kept],
    close: () => new Promise<void>((resolve) => server.close(() => resolve())),
  };
}
