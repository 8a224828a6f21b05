import type { NextFunction, Request, Response } from 'express';
import type { z } from 'zod';
import { unprocessable, type FieldIssue } from '../errors';

declare module 'express-serve-static-core' {
  interface Request {
    /** Parsed and validated request parts, set by validate(). Handlers read these, never the raw ones. */
    valid: { body?: unknown; query?: unknown; params?: unknown };
  }
}

/** Turns zod issues into the API's field list. */
export function fieldIssues(error: z.ZodError): FieldIssue[] {
  return error.issues.map((i) => ({ path: i.path.join('.'), message: i.message }));
}

type Part = 'body' | 'query' | 'params';

/**
 * Checks one part of the request against a shared zod schema and keeps the parsed value in
 * req.valid[part]; a mismatch answers 422 with the field errors.
 */
export function validate<S extends z.ZodType>(schema: S, part: Part = 'body') {
  return (req: Request, _res: Response, next: NextFunction) => {
    const result = schema.safeParse(req[part] ?? {});
    if (!result.success) {
      throw unprocessable('Some fields are not valid; see details.', fieldIssues(result.error));
    }
    req.valid = { ...(req.valid ?? {}), [part]: result.data };
    next();
  };
}

/** The parsed value validate() left for this part, typed by the same schema. */
export function parsed<S extends z.ZodType>(req: Request, _schema: S, part: Part = 'body'): z.infer<S> {
  return req.valid[part] as z.infer<S>;
}
