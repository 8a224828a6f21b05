import type { Sequelize } from 'sequelize';
import { MIGRATIONS_TABLE } from './schema-version';

const ident = (s: string) => `"${s.replace(/"/g, '""')}"`;

/**
 * Gives the application's role what it needs and no more: read and write on ordinary tables,
 * but only INSERT and SELECT on every table that carries an append-only trigger (the ledger and
 * its companions). Run as the owner after every migration; safe to repeat.
 */
export async function grantAppRole(owner: Sequelize, appRole: string): Promise<void> {
  const [me] = await owner.query('SELECT current_user AS name');
  if ((me as { name: string }[])[0]?.name === appRole) return;
  const role = ident(appRole);
  const [appendOnly] = await owner.query(
    `SELECT DISTINCT event_object_table AS name FROM information_schema.triggers
      WHERE trigger_schema = 'public' AND trigger_name LIKE '%append_only%'`,
  );
  await owner.query(`GRANT USAGE ON SCHEMA public TO ${role}`);
  await owner.query(`GRANT SELECT, INSERT, UPDATE, DELETE ON ALL TABLES IN SCHEMA public TO ${role}`);
  await owner.query(`GRANT USAGE, SELECT ON ALL SEQUENCES IN SCHEMA public TO ${role}`);
  await owner.query(`REVOKE ALL ON ${MIGRATIONS_TABLE} FROM ${role}`);
  await owner.query(`GRANT SELECT ON ${MIGRATIONS_TABLE} TO ${role}`);
  for (const { name } of appendOnly as { name: string }[]) {
    await owner.query(`REVOKE UPDATE, DELETE, TRUNCATE ON ${ident(name)} FROM ${role}`);
  }
}

/** The role name in a postgres:// URL. */
export function roleOf(url: string): string {
  return decodeURIComponent(new URL(url).username);
}
