import path from 'node:path';
import { startStandInSmtp, type StandInSmtp } from '../../server/mail/stand-in';

/**
 * Starts the stand-in SMTP server for `npm start` when no SMTP_HOST is configured: on loopback,
 * keeping every message in `<dataDir>/outbox`. Returns the settings to pass to the app, or null
 * when real SMTP is configured.
 */
export async function startMailStandIn(dataDir: string): Promise<{ server: StandInSmtp; env: Record<string, string> } | null> {
  if (process.env.SMTP_HOST) return null;
  const dir = path.join(dataDir, 'outbox');
  const server = await startStandInSmtp({ dir });
  return { server, env: { SMTP_HOST: server.host, SMTP_PORT: String(server.port), SMTP_OUTBOX_DIR: dir } };
}
