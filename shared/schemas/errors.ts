/** One field-level problem in a request, named by its path: the `details` of a 422 answer. */
export interface FieldIssue {
  path: string;
  message: string;
}

/** Every error answer of the API: `{ error: { code, message, details } }`. */
export interface ErrorBody {
  error: { code: string; message: string; details?: unknown };
}
