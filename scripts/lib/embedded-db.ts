import { randomBytes } from 'node:crypto';
import { existsSync, mkdirSync, readFileSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { freePort, provisionDatabase, roleUrl, startCluster, type PgCluster } from './pg-cluster';
import { ensureSystemPackages, NEEDS } from './system-packages';

/** Secrets generated once into the data folder and reused on every start. */
interface LocalSecrets {
  sessionSecret: string;
  pgSuperPassword: string;
  ownerPassword: string;
  appPassword: string;
  pgPort: number;
}

const PREFERRED_PG_PORT = 54329;

async function loadOrCreateSecrets(dataDir: string): Promise<LocalSecrets> {
  const file = path.join(dataDir, 'secrets.json');
  if (existsSync(file)) return JSON.parse(readFileSync(file, 'utf8')) as LocalSecrets;
  mkdirSync(dataDir, { recursive: true });
  const preferredFree = await freePort().then(() => portIsFree(PREFERRED_PG_PORT));
  const secrets: LocalSecrets = {
    sessionSecret: randomBytes(32).toString('base64url'),
    pgSuperPassword: randomBytes(18).toString('base64url'),
    ownerPassword: randomBytes(18).toString('base64url'),
    appPassword: randomBytes(18).toString('base64url'),
    pgPort: preferredFree ? PREFERRED_PG_PORT : await freePort(),
  };
  writeFileSync(file, JSON.stringify(secrets, null, 2), { mode: 0o600 });
  return secrets;
}

async function portIsFree(port: number): Promise<boolean> {
  const { createServer } = await import('node:net');
  return new Promise((resolve) => {
    const srv = createServer();
    srv.once('error', () => resolve(false));
    srv.listen(port, '127.0.0.1', () => srv.close(() => resolve(true)));
  });
}

export interface PreparedDatabase {
  appUrl: string;
  ownerUrl: string;
  sessionSecret: string;
  cluster: PgCluster | null;
}

/**
 * With DATABASE_URL set, uses it (MIGRATION_DATABASE_URL for migrations when given). Otherwise
 * brings up the private PostgreSQL in `dataDir` on loopback and provisions its roles.
 */
export async function prepareDatabase(dataDir: string): Promise<PreparedDatabase> {
  const secrets = await loadOrCreateSecrets(dataDir);
  const sessionSecret = process.env.SESSION_SECRET ?? secrets.sessionSecret;
  if (process.env.DATABASE_URL) {
    return {
      appUrl: process.env.DATABASE_URL,
      ownerUrl: process.env.MIGRATION_DATABASE_URL ?? process.env.DATABASE_URL,
      sessionSecret,
      cluster: null,
    };
  }
  ensureSystemPackages([NEEDS.postgresql], 'npm start (the embedded PostgreSQL)');
  const cluster = startCluster({ dir: path.resolve(dataDir, 'postgres'), port: secrets.pgPort, superPassword: secrets.pgSuperPassword });
  const roles = {
    database: 'halfmark',
    owner: { name: 'halfmark_owner', password: secrets.ownerPassword },
    app: { name: 'halfmark_app', password: secrets.appPassword },
  };
  try {
    await provisionDatabase(cluster.adminUrl(), roles);
  } catch (err) {
    cluster.stop();
    throw err;
  }
  return {
    appUrl: roleUrl(cluster.port, roles.database, roles.app),
    ownerUrl: roleUrl(cluster.port, roles.database, roles.owner),
    sessionSecret,
    cluster,
  };
}
