import type { FieldIssue } from '../shared/schemas/errors';

export type { FieldIssue } from '../shared/schemas/errors';

/**
 * An error the API answers with `{ error: { code, message, details } }`. Throw it from any handler;
 * the error middleware turns it into the response.
 */
export class AppError extends Error {
  constructor(
    readonly status: number,
    readonly code: string,
    message: string,
    readonly details?: unknown,
  ) {
    super(message);
  }
}

export const badRequest = (message: string, details?: unknown) => new AppError(400, 'bad_request', message, details);
export const unauthorized = (message = 'Sign in to continue.') => new AppError(401, 'unauthorized', message);
export const forbidden = (message = 'Your role may not do this.', details?: unknown) =>
  new AppError(403, 'forbidden', message, details);
export const notFound = (message: string) => new AppError(404, 'not_found', message);
export const conflict = (code: string, message: string, details?: unknown) => new AppError(409, code, message, details);
export const unprocessable = (message: string, details?: FieldIssue[] | unknown) =>
  new AppError(422, 'invalid', message, details);
export const tooMany = (message: string) => new AppError(429, 'too_many_requests', message);
