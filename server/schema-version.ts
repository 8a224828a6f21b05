/**
 * Which migration a database is at, readable without loading the migrator: the running server
 * (its health check) and the role grants need only this, not umzug.
 */
import type { Sequelize } from 'sequelize';

/** The table where umzug records which migrations ran. */
export const MIGRATIONS_TABLE = 'schema_migrations';

/** The name of the last migration applied, or null on an empty database. */
export async function lastMigration(sequelize: Sequelize): Promise<string | null> {
  const [rows] = await sequelize.query(`SELECT name FROM ${MIGRATIONS_TABLE} ORDER BY name DESC LIMIT 1`);
  const first = (rows as { name: string }[])[0];
  return first ? first.name : null;
}
