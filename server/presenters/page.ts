import type { Page } from '../../shared/schemas/intake-common';
import { can } from '../../shared/permissions';
import type { Actor } from '../middleware/auth';

/**
 * Whether the caller may create and change intake records; answers carry it so the client shows
 * or hides its forms without copying the role rules.
 *
 * @param actor - The caller, if any.
 */
export function canWriteIntake(actor: Actor | undefined): boolean {
  return actor?.kind === 'user' && can(actor.role, 'intake.write');
}

/**
 * One page of a list, as every list route answers it.
 *
 * @param items - The presented rows.
 * @param total - Rows across all pages.
 * @param query - The page asked for.
 * @param actor - The caller.
 */
export function presentPage<T>(items: T[], total: number, query: { page: number; pageSize: number }, actor: Actor | undefined): Page<T> {
  return { items, total, page: query.page, pageSize: query.pageSize, canWrite: canWriteIntake(actor) };
}

/** A timestamp as ISO 8601 text; PostgreSQL rows give Date objects. */
export function isoTime(value: Date | string): string {
  return value instanceof Date ? value.toISOString() : new Date(value).toISOString();
}
