import type { Sequelize, Transaction } from 'sequelize';

/** A list's SQL parts: what to select, from where, and the filters built so far. */
export interface ListSql {
  /** Columns of one row, e.g. "c.*, count(o.id) AS order_count". */
  select: string;
  /** FROM and JOIN clauses, without the word FROM. */
  from: string;
  /** Conditions joined with AND; they use $1… placeholders from `bind`. */
  where: string[];
  bind: unknown[];
  /** GROUP BY clause, without the words, when the select aggregates. */
  groupBy?: string;
}

/**
 * Escapes LIKE wildcards in a search term and wraps it for a "contains" match.
 *
 * @param q - What the person typed.
 */
export function containsPattern(q: string): string {
  return `%${q.replace(/[\\%_]/g, '\\$&')}%`;
}

/**
 * Adds a condition and its value to a list's SQL; `?` in the condition becomes the next placeholder.
 *
 * @param sql - The list being built.
 * @param condition - e.g. "o.customer_id = ?".
 * @param value - The value bound to each `?`.
 */
export function addFilter(sql: ListSql, condition: string, value: unknown): void {
  sql.bind.push(value);
  sql.where.push(condition.replaceAll('?', `$${sql.bind.length}`));
}

/**
 * The ORDER BY clause for a sort key (a leading "-" sorts descending), always ending in a unique
 * column so that pages never overlap or skip a row.
 *
 * @param sort - e.g. "-dueDate".
 * @param columns - SQL expression per sort key.
 * @param tieBreak - A unique column, e.g. "o.id".
 */
export function orderBySql(sort: string, columns: Record<string, string>, tieBreak: string): string {
  const desc = sort.startsWith('-');
  const column = columns[sort.replace(/^-/, '')] ?? tieBreak;
  const dir = desc ? 'DESC' : 'ASC';
  return `${column} ${dir} NULLS LAST, ${tieBreak} ${dir}`;
}

/**
 * Runs a list query: one page of rows and the total count, with the same filters.
 *
 * @param sequelize - The connection.
 * @param sql - The list's SQL parts.
 * @param order - The ORDER BY clause from {@link orderBySql}.
 * @param page - 1-based page.
 * @param pageSize - Rows a page.
 */
export async function runList<Row>(
  sequelize: Sequelize,
  sql: ListSql,
  order: string,
  page: number,
  pageSize: number,
  transaction?: Transaction,
): Promise<{ rows: Row[]; total: number }> {
  const where = sql.where.length > 0 ? `WHERE ${sql.where.join(' AND ')}` : '';
  const group = sql.groupBy ? `GROUP BY ${sql.groupBy}` : '';
  const bind = [...sql.bind, pageSize, (page - 1) * pageSize];
  const [rows] = await sequelize.query(
    `SELECT ${sql.select} FROM ${sql.from} ${where} ${group} ORDER BY ${order} LIMIT $${bind.length - 1} OFFSET $${bind.length}`,
    { bind, transaction },
  );
  const [counted] = await sequelize.query(
    sql.groupBy
      ? `SELECT count(*)::int AS total FROM (SELECT 1 FROM ${sql.from} ${where} ${group}) AS grouped`
      : `SELECT count(*)::int AS total FROM ${sql.from} ${where}`,
    { bind: sql.bind, transaction },
  );
  return { rows: rows as Row[], total: (counted as { total: number }[])[0]?.total ?? 0 };
}
