import pg from 'pg';
import { Sequelize } from 'sequelize';

/** Opens a Sequelize connection to PostgreSQL; every timestamp is handled in UTC. */
export function createSequelize(url: string, opts: { poolMax?: number } = {}): Sequelize {
  return new Sequelize(url, {
    dialect: 'postgres',
    dialectModule: pg,
    logging: false,
    timezone: '+00:00',
    pool: { max: opts.poolMax ?? 10, min: 0, idle: 10_000, acquire: 20_000 },
    define: { underscored: true },
  });
}
