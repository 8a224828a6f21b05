import type { Config } from '../../server/config';
import { createContext } from '../../server/app';
import { createSequelize } from '../../server/db';
import { loadDemoLab } from '../../server/demo/seed';

/** Loads the invented demo lab when the database holds no customers yet; returns what to print. */
export async function loadDemoIfEmpty(config: Config): Promise<string | null> {
  const sequelize = createSequelize(config.DATABASE_URL, { poolMax: 4 });
  try {
    const [rows] = await sequelize.query('SELECT count(*)::int AS n FROM customers');
    if ((rows as { n: number }[])[0]!.n > 0) return null;
    return await loadDemoLab(createContext(config, sequelize));
  } finally {
    await sequelize.close();
  }
}
