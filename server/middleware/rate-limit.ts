import type { NextFunction, Request, RequestHandler, Response } from 'express';
import { rateLimit } from 'express-rate-limit';
import type { AppContext } from '../app';
import { AppError } from '../errors';

const limiters = new WeakMap<AppContext, RequestHandler>();

/**
 * Limits sign-in attempts (and other password checks) per client address, with the limits from
 * the app's configuration. Each app context gets its own counter, so test apps do not share one.
 * Answers 429 `rate_limited` in the API's error shape.
 */
export function passwordRateLimit(): RequestHandler {
  return (req: Request, res: Response, next: NextFunction) => {
    let limiter = limiters.get(req.ctx);
    if (!limiter) {
      const { LOGIN_RATE_LIMIT_MAX: max, LOGIN_RATE_LIMIT_WINDOW_SECONDS: seconds, NODE_ENV } = req.ctx.config;
      // Test files sign in dozens of people from one address; the trip itself has its own test.
      const limit = max ?? (NODE_ENV === 'test' ? 1000 : 30);
      limiter = rateLimit({
        windowMs: seconds * 1000,
        limit,
        standardHeaders: 'draft-7',
        legacyHeaders: false,
        // Made once per app context on its first request (the limits live in that context), not per request.
        validate: { creationStack: false },
        handler: (_req, _res, nextFn) =>
          nextFn(new AppError(429, 'rate_limited', `Too many attempts from this address. Wait ${seconds} seconds and try again.`)),
      });
      limiters.set(req.ctx, limiter);
    }
    return limiter(req, res, next);
  };
}
