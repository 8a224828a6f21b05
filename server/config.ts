import { z } from 'zod';

const postgresUrl = z
  .string()
  .regex(/^postgres(ql)?:\/\//, 'must be a postgres:// or postgresql:// connection string');

/** Every setting Halfmark reads from the environment, checked once at start. */
export const ConfigSchema = z.object({
  NODE_ENV: z.enum(['development', 'production', 'test']).default('development'),
  HOST: z.string().default('127.0.0.1'),
  PORT: z.coerce.number().int().min(0).max(65535).default(4870),
  DATABASE_URL: postgresUrl,
  MIGRATION_DATABASE_URL: postgresUrl.optional(),
  SESSION_SECRET: z.string().min(32, 'must be at least 32 characters'),
  DATA_DIR: z.string().default('.data'),
  PUBLIC_URL: z.string().url().optional(),
  /** How far a device's clock may be from the server's before an event is refused. */
  MAX_CLOCK_SKEW_HOURS: z.coerce.number().positive().default(24),
  DB_POOL_MAX: z.coerce.number().int().min(1).max(200).default(10),
  /** Outgoing mail. Without SMTP_HOST, a stand-in SMTP server on loopback keeps every message instead. */
  SMTP_HOST: z.string().min(1).optional(),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(587),
  SMTP_USER: z.string().optional(),
  SMTP_PASS: z.string().optional(),
  SMTP_SECURE: z.enum(['true', 'false']).default('false').transform((v) => v === 'true'),
  SMTP_FROM: z.string().default('Halfmark <halfmark@localhost>'),
  /** Where the stand-in SMTP server keeps messages; set by `npm start` when it runs the stand-in. */
  SMTP_OUTBOX_DIR: z.string().optional(),
  /**
   * Password checks (sign-in, signatures, reset requests) allowed per client address per window;
   * accounts also lock after wrong passwords. Unset: 30, or 1000 under NODE_ENV=test.
   */
  LOGIN_RATE_LIMIT_MAX: z.coerce.number().int().min(1).optional(),
  LOGIN_RATE_LIMIT_WINDOW_SECONDS: z.coerce.number().int().min(1).default(60),
  /**
   * Object storage for attachments (any S3-compatible service). `npm start`, `npm run dev` and the
   * tests run a stand-in on loopback and set these; when neither S3_ENDPOINT nor S3_BUCKET is set, uploads
   * answer 503.
   */
  S3_ENDPOINT: z.string().url().optional(),
  S3_BUCKET: z.string().min(3).max(63).optional(),
  S3_ACCESS_KEY_ID: z.string().min(1).optional(),
  S3_SECRET_ACCESS_KEY: z.string().min(1).optional(),
  S3_REGION: z.string().min(1).default('us-east-1'),
  /** Path-style URLs (bucket in the path): what stand-ins and most S3-compatible stores want. */
  S3_FORCE_PATH_STYLE: z.enum(['true', 'false']).default('true').transform((v) => v === 'true'),
  LOG_LEVEL: z.enum(['fatal', 'error', 'warn', 'info', 'debug', 'trace', 'silent']).default('info'),
});

export type Config = z.infer<typeof ConfigSchema>;

/** Thrown when the environment holds a bad value; the message names the variable. */
export class ConfigError extends Error {}

/** Parses the environment; a bad value stops the start with a message that names the variable. */
export function loadConfig(env: NodeJS.ProcessEnv = process.env): Config {
  const parsed = ConfigSchema.safeParse(env);
  if (!parsed.success) {
    const lines = parsed.error.issues.map((i) => {
      const name = i.path.join('.');
      const got = env[name] === undefined ? 'it is not set' : `got ${JSON.stringify(env[name])}`;
      return `  ${name}: ${i.message} (${got})`;
    });
    throw new ConfigError(`Halfmark cannot start: bad configuration in the environment.\n${lines.join('\n')}`);
  }
  return parsed.data;
}
