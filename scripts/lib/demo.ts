import type { Config } from '../../server/config';
import { createSequelize } from '../../server/db';
import { seedDemoLab } from '../../server/demo/seed';

/** Loads the invented demo lab when the database holds no customers yet; returns what to print. */
export async function loadDemoIfEmpty(config: Config): Promise<string | null> {
  const sequelize = createSequelize(config.DATABASE_URL, { poolMax: 4 });
  try {
    const [rows] = await sequelize.query('SELECT count(*)::int AS n FROM customers');
    if ((rows as { n: number }[])[0]!.n > 0) return null;
    return await seedDemoLab(sequelize);
  } finally {
    await sequelize.close();
  }
}
