import { existsSync } from 'node:fs';
import path from 'node:path';
import cookieParser from 'cookie-parser';
import express, { type Express } from 'express';
import helmet from 'helmet';
import type { Sequelize } from 'sequelize';
import type { Config } from './config';
import { notFound } from './errors';
import { errorHandler } from './middleware/error-handler';
import { apiRouter } from './routes';
import { authenticate } from './middleware/auth';
import { defineModels, type Models } from './models/registry';
import { registerNativeHash } from './ledger/native-hash';
import { createMailer, type Mailer } from './mail/mailer';
import { createObjectStore, type ObjectStore } from './storage/object-store';
import { createSessionUsers, type SessionUsers } from './auth/session-users';

/** Files of the built client that are never served from a browser's HTTP cache without asking. */
const REVALIDATED_FILES = new Set(['sw.js', 'manifest.webmanifest', 'index.html']);

/** What every part of the server may need: the configuration and the database. */
export interface AppContext {
  config: Config;
  sequelize: Sequelize;
  models: Models;
  /** Outgoing mail (a loopback stand-in when SMTP_HOST is not set). */
  mailer: Mailer;
  /** Attachment storage (S3-compatible); null when none is configured. */
  storage: ObjectStore | null;
  /** The users behind session cookies, remembered for a few seconds. */
  sessionUsers: SessionUsers;
}

/** Binds the models to the connection and bundles what the handlers need. */
export function createContext(config: Config, sequelize: Sequelize): AppContext {
  registerNativeHash();
  const models = defineModels(sequelize);
  return {
    config,
    sequelize,
    models,
    mailer: createMailer(config),
    storage: createObjectStore(config),
    sessionUsers: createSessionUsers(models.User),
  };
}

declare module 'express-serve-static-core' {
  interface Request {
    ctx: AppContext;
  }
}

/**
 * Builds the Express app: the API under /api and, when a built client exists in `clientDir`,
 * the single-page app with its fallback route.
 */
export function createApp(ctx: AppContext, opts: { clientDir?: string } = {}): Express {
  const app = express();
  app.disable('x-powered-by');
  app.set('trust proxy', 'loopback');
  app.use(
    helmet({
      contentSecurityPolicy: {
        directives: {
          defaultSrc: ["'self'"],
          scriptSrc: ["'self'"],
          styleSrc: ["'self'"],
          imgSrc: ["'self'", 'data:', 'blob:'],
          mediaSrc: ["'self'", 'blob:'],
          fontSrc: ["'self'"],
          connectSrc: ["'self'"],
          frameSrc: ["'self'", 'blob:'],
          objectSrc: ["'none'"],
          workerSrc: ["'self'", 'blob:'],
          frameAncestors: ["'self'"],
          upgradeInsecureRequests: null,
        },
      },
      crossOriginEmbedderPolicy: false,
    }),
  );
  app.use((req, _res, next) => {
    req.ctx = ctx;
    next();
  });
  app.use(express.json({ limit: '2mb' }));
  app.use(cookieParser());

  app.use('/api', authenticate, apiRouter());
  app.use('/api', (req) => {
    throw notFound(`No API route answers ${req.method} ${req.originalUrl}.`);
  });

  const clientDir = opts.clientDir;
  if (clientDir && existsSync(path.join(clientDir, 'index.html'))) {
    app.use('/assets', express.static(path.join(clientDir, 'assets'), { immutable: true, maxAge: '1y' }));
    app.use(
      express.static(clientDir, {
        index: false,
        maxAge: '1h',
        setHeaders: (res, file) => {
          // The app-shell worker and what it reads at install must be checked on every visit, so
          // a deploy reaches phones at their next visit instead of an hour later.
          if (REVALIDATED_FILES.has(path.basename(file))) res.setHeader('Cache-Control', 'no-cache');
        },
      }),
    );
    app.get('/{*splat}', (_req, res) => {
      res.setHeader('Cache-Control', 'no-cache');
      res.sendFile(path.join(clientDir, 'index.html'));
    });
  }
  app.use(errorHandler);
  return app;
}
