import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import type { Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db';
import { createMigrator } from '../../server/migrator';
import { createTestDatabase, dropTestDatabase, testUrl } from '../support';

async function tables(sequelize: Sequelize): Promise<string[]> {
  const [rows] = await sequelize.query(
    `SELECT table_name AS name FROM information_schema.tables WHERE table_schema = 'public' AND table_name <> 'schema_migrations' ORDER BY 1`,
  );
  return (rows as { name: string }[]).map((r) => r.name);
}

describe('migrations', () => {
  let database: string;
  let owner: Sequelize;
  beforeAll(async () => {
    database = await createTestDatabase({ empty: true });
    owner = createSequelize(testUrl(database, 'owner'), { poolMax: 1 });
  });
  afterAll(async () => {
    await owner.close();
    await dropTestDatabase(database);
  });

  it('apply every one up, then every one down, then up again', async () => {
    const migrator = createMigrator(owner);
    const all = await migrator.pending();
    expect(all.length).toBeGreaterThan(0);

    await migrator.up();
    const afterUp = await tables(owner);
    expect(afterUp).toContain('custody_events');

    await migrator.down({ to: 0 });
    expect(await tables(owner)).toEqual([]);
    expect(await migrator.executed()).toEqual([]);

    await migrator.up();
    expect(await tables(owner)).toEqual(afterUp);
    expect((await migrator.executed()).map((m) => m.name)).toEqual(all.map((m) => m.name));
  });
});
