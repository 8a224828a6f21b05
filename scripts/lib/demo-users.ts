import type { Config } from '../../server/config';
import { createSequelize } from '../../server/db';
import { demoSignInLines, seedDemoUsers } from '../../server/demo/seed';

/**
 * Adds the demo people when the database has nobody yet. Returns the demo sign-ins to print
 * while the demo accounts still exist, or null once the lab has replaced them.
 */
export async function loadDemoUsers(config: Config): Promise<string | null> {
  const sequelize = createSequelize(config.DATABASE_URL, { poolMax: 2 });
  try {
    const added = await seedDemoUsers(sequelize);
    if (added) return added;
    const [rows] = await sequelize.query(`SELECT count(*)::int AS n FROM users WHERE email LIKE '%@larchmere.example' AND active`);
    return (rows as { n: number }[])[0]!.n > 0 ? demoSignInLines() : null;
  } finally {
    await sequelize.close();
  }
}
