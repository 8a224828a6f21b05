import type { Server } from 'node:http';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { createApp, createContext } from './app';
import type { Config } from './config';
import { createSequelize } from './db';
import { startSealScheduler } from './commands/seal-day';
import { startDigestScheduler } from './jobs/retention-digest';

const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/** A listening Halfmark server and how to stop it. */
export interface RunningServer {
  server: Server;
  url: string;
  close: () => Promise<void>;
}

/** Connects to the database as the app role and serves the API and the built client. */
export async function listen(config: Config): Promise<RunningServer> {
  const sequelize = createSequelize(config.DATABASE_URL, { poolMax: config.DB_POOL_MAX });
  await sequelize.authenticate();
  const ctx = createContext(config, sequelize);
  const app = createApp(ctx, { clientDir: path.join(root, 'dist') });
  // Seals each finished UTC day once; several servers coordinate through an advisory lock.
  const sealer = startSealScheduler(sequelize);
  // Mails the clerks what falls due; the day's job_runs row lets only one server send it.
  const digest = startDigestScheduler(ctx);
  const server = await new Promise<Server>((resolve, reject) => {
    const s = app.listen(config.PORT, config.HOST, () => resolve(s));
    s.once('error', reject);
  });
  const addr = server.address();
  const port = typeof addr === 'object' && addr ? addr.port : config.PORT;
  return {
    server,
    url: `http://${config.HOST}:${port}`,
    close: async () => {
      sealer.stop();
      digest.stop();
      await new Promise<void>((resolve) => server.close(() => resolve()));
      server.closeAllConnections();
      await sequelize.close();
    },
  };
}
