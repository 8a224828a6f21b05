import type { Sequelize } from 'sequelize';
import { defineUser } from './user';

/**
 * The models bound to one connection. Each app context gets its own set, so tests can run
 * several apps on several databases in one process.
 */
export function defineModels(sequelize: Sequelize) {
  return {
    User: defineUser(sequelize),
  };
}

export type Models = ReturnType<typeof defineModels>;
