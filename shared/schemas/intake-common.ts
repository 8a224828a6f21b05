/**
 * Building blocks the intake schemas share: list queries (search, sort, paging, filters) and
 * field parsers that accept both JSON values and the strings a form or a URL gives.
 */
import { z } from 'zod';

/** Page sizes a list offers. */
export const PAGE_SIZES = [10, 25, 50, 100] as const;

/** The default number of rows on one page of a list. */
export const DEFAULT_PAGE_SIZE = 25;

/** One page of a list, as every list route answers it. */
export interface Page<T> {
  items: T[];
  total: number;
  page: number;
  pageSize: number;
  /** Whether the caller may create and change these records. */
  canWrite: boolean;
}

// Forms and query strings send "" for an empty field; treat it as "not given".
const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const blankToNull = (v: unknown) => (v === undefined ? undefined : typeof v === 'string' && v.trim() === '' ? null : v);
const numeric = (v: unknown) => (typeof v === 'string' && /^\s*-?\d+(\.\d+)?\s*$/.test(v) ? Number(v) : v);

/**
 * A record id: a positive whole number, from JSON or from a string.
 *
 * @param message - What the person should do when it is missing or wrong.
 */
export function idField(message: string) {
  return z.preprocess((v) => numeric(blankToUndefined(v)), z.number({ error: message }).int(message).positive(message));
}

/**
 * A whole number within bounds, from JSON or from a form's string.
 *
 * @param min - Smallest allowed.
 * @param max - Largest allowed.
 * @param message - Said for anything else.
 */
export function wholeNumber(min: number, max: number, message: string) {
  return z.preprocess((v) => numeric(blankToUndefined(v)), z.number({ error: message }).int(message).min(min, message).max(max, message));
}

/**
 * Like {@link wholeNumber}, but an empty field means null ("not set").
 *
 * @param min - Smallest allowed.
 * @param max - Largest allowed.
 * @param message - Said for anything else.
 */
export function optionalWholeNumber(min: number, max: number, message: string) {
  return z.preprocess((v) => numeric(blankToNull(v)), z.number({ error: message }).int(message).min(min, message).max(max, message).nullable()).optional();
}

/**
 * Required text, trimmed.
 *
 * @param max - Longest allowed.
 * @param message - Said when it is empty.
 */
export function requiredText(max: number, message: string) {
  return z.string({ error: message }).trim().min(1, message).max(max, `Keep this under ${max + 1} characters.`);
}

/**
 * Optional text, trimmed; empty means null.
 *
 * @param max - Longest allowed.
 */
export function optionalText(max: number) {
  return z.preprocess(blankToNull, z.string().trim().max(max, `Keep this under ${max + 1} characters.`).nullable()).optional();
}

/** An optional calendar date as YYYY-MM-DD; empty means null. */
export const OptionalDateSchema = z
  .preprocess(blankToNull, z.iso.date({ error: 'Enter a date as YYYY-MM-DD.' }).nullable())
  .optional();

/** An optional filter value from the query string: empty means no filter. */
export function filterParam<S extends z.ZodType>(schema: S) {
  return z.preprocess(blankToUndefined, schema.optional());
}

/**
 * The query of a list route: `q` (search), `sort` (a key, `-key` for descending), `page`, `pageSize`.
 *
 * @param sortKeys - The keys the list can sort by.
 * @param defaultSort - The sort when none is asked for, e.g. "-createdAt".
 */
export function listQuerySchema<K extends string>(sortKeys: readonly K[], defaultSort: `${'' | '-'}${K}`) {
  return z.object({
    q: z.preprocess(blankToUndefined, z.string().trim().max(200, 'Search for at most 200 characters.').optional()),
    sort: z
      .preprocess(blankToUndefined, z.string().default(defaultSort))
      .refine((s) => (sortKeys as readonly string[]).includes(s.replace(/^-/, '')), {
        message: `Sort by one of: ${sortKeys.join(', ')} (a leading "-" sorts descending).`,
      })
      .transform((s) => s as `${'' | '-'}${K}`),
    page: z.preprocess((v) => numeric(blankToUndefined(v)), z.number().int().min(1, 'Pages start at 1.').default(1)),
    pageSize: z.preprocess(
      (v) => numeric(blankToUndefined(v)),
      z.number().int().min(1).max(100, 'Ask for at most 100 rows a page.').default(DEFAULT_PAGE_SIZE),
    ),
  });
}

/** Route parameters `/:id` of a record. */
export const IdParamsSchema = z.object({ id: idField('The id in the address is a positive whole number.') });
