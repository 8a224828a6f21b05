import pino from 'pino';

/** The server's structured logger; quiet in tests unless LOG_LEVEL says otherwise. */
export const logger = pino({
  level: process.env.LOG_LEVEL ?? (process.env.NODE_ENV === 'test' ? 'silent' : 'info'),
  base: undefined,
});
