import type { Sequelize } from 'sequelize';
import { createSequelize } from '../../server/db';
import { registerNativeHash } from '../../server/ledger/native-hash';
import { prepareDatabase } from './embedded-db';

/**
 * Runs a ledger check against the database the embedded default or DATABASE_URL names, as the
 * application's role, with the server's native hashing; exits 0 when `check` answers true, else 1.
 */
export async function runLedgerScript(check: (sequelize: Sequelize) => Promise<boolean>): Promise<never> {
  registerNativeHash();
  const db = await prepareDatabase(process.env.DATA_DIR ?? '.data');
  const sequelize = createSequelize(db.appUrl, { poolMax: 2 });
  let code = 1;
  try {
    code = (await check(sequelize)) ? 0 : 1;
  } catch (err) {
    console.error(err);
  } finally {
    await sequelize.close();
    db.cluster?.stop();
  }
  process.exit(code);
}
