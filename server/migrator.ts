import path from 'node:path';
import { fileURLToPath, pathToFileURL } from 'node:url';
import type { QueryInterface, Sequelize } from 'sequelize';
import { SequelizeStorage, Umzug } from 'umzug';
import { MIGRATIONS_TABLE } from './schema-version';

export interface MigrationContext {
  queryInterface: QueryInterface;
  sequelize: Sequelize;
}

interface MigrationModule {
  up: (params: { context: MigrationContext }) => Promise<void>;
  down: (params: { context: MigrationContext }) => Promise<void>;
}


const root = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..');

/**
 * The only way the schema changes: the files in migrations/, applied in name order by umzug.
 * Each file is loaded with a dynamic import because umzug's default resolver fails on .ts under tsx.
 */
export function createMigrator(sequelize: Sequelize): Umzug<MigrationContext> {
  return new Umzug<MigrationContext>({
    migrations: {
      glob: ['migrations/*.ts', { cwd: root, ignore: ['**/*.test.ts', '**/*.d.ts'] }],
      resolve: ({ name, path: file, context }) => ({
        name,
        up: async () => ((await import(pathToFileURL(file!).href)) as MigrationModule).up({ context }),
        down: async () => ((await import(pathToFileURL(file!).href)) as MigrationModule).down({ context }),
      }),
    },
    context: { queryInterface: sequelize.getQueryInterface(), sequelize },
    storage: new SequelizeStorage({ sequelize, tableName: MIGRATIONS_TABLE }),
    logger: undefined,
  });
}
