import type { NextFunction, Request, Response } from 'express';
import { ZodError } from 'zod';
import type { ErrorBody } from '../../shared/schemas/errors';
import { AppError } from '../errors';
import { fieldIssues } from './validate';
import { logger } from '../logger';

interface DbErrorLike {
  name?: string;
  parent?: { code?: string; message?: string; constraint?: string };
  original?: { code?: string };
  errors?: { path?: string; message?: string }[];
  type?: string;
  status?: number;
  statusCode?: number;
}

/** Maps any thrown error to the one error shape, translating database and parser errors. */
function toAppError(err: unknown): AppError {
  if (err instanceof AppError) return err;
  if (err instanceof ZodError) return new AppError(422, 'invalid', 'Some fields are not valid; see details.', fieldIssues(err));
  const e = err as DbErrorLike;
  if (e?.type === 'entity.parse.failed') return new AppError(400, 'malformed_json', 'The request body is not valid JSON.');
  if (e?.type === 'entity.too.large') return new AppError(413, 'too_large', 'The request body is too large.');
  const pgCode = e?.parent?.code ?? e?.original?.code;
  if (e?.name === 'SequelizeUniqueConstraintError' || pgCode === '23505') {
    return new AppError(409, 'duplicate', 'A record with the same identifying value already exists.', (e.errors ?? []).map((x) => ({ path: x.path ?? '', message: x.message ?? '' })));
  }
  if (pgCode === '23503') return new AppError(409, 'reference', 'This refers to a record that does not exist or is still in use.');
  if (pgCode === 'P0001') return new AppError(403, 'append_only', e.parent?.message ?? 'This record may not be changed.');
  if (pgCode === '42501') return new AppError(403, 'db_permission', 'The database refused this change for the application role.');
  if (e?.name === 'SequelizeConnectionError' || e?.name === 'SequelizeConnectionRefusedError' || pgCode === '57P01') {
    return new AppError(503, 'db_unavailable', 'The database is unreachable; try again shortly.');
  }
  const status = e?.status ?? e?.statusCode;
  if (status && status >= 400 && status < 500) return new AppError(status, 'bad_request', (err as Error).message);
  return new AppError(500, 'internal', 'Something went wrong on the server; the error has been logged.');
}

/** The single error middleware: every error answer has the shape { error: { code, message, details } }. */
export function errorHandler(err: unknown, req: Request, res: Response, _next: NextFunction): void {
  const appErr = toAppError(err);
  if (appErr.status >= 500) logger.error({ err, path: req.path }, 'request failed');
  const body: ErrorBody = {
    error: { code: appErr.code, message: appErr.message, ...(appErr.details !== undefined ? { details: appErr.details } : {}) },
  };
  res.status(appErr.status).json(body);
}
