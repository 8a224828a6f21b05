/**
 * npm run ledger:verify: recomputes every event hash, chain link, item head and daily seal of
 * the ledger that the embedded default or DATABASE_URL names; prints the report and exits 1 at
 * the first break.
 */
import { createSequelize } from '../server/db';
import { verifyLedger } from '../server/commands/verify-ledger';
import { registerNativeHash } from '../server/ledger/native-hash';
import { prepareDatabase } from './lib/embedded-db';

registerNativeHash();

const db = await prepareDatabase(process.env.DATA_DIR ?? '.data');
const sequelize = createSequelize(db.appUrl, { poolMax: 2 });
let code = 1;
try {
  const started = Date.now();
  const report = await verifyLedger(sequelize);
  console.log(JSON.stringify(report, null, 2));
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (report.ok) {
    console.log(`Ledger verified: ${report.eventsChecked} events and ${report.sealsChecked} seals, no break (${seconds} s).`);
    code = 0;
  } else {
    console.log(`LEDGER BREAK: ${report.firstBreak?.message}`);
  }
} catch (err) {
  console.error(err);
} finally {
  await sequelize.close();
  db.cluster?.stop();
}
process.exit(code);
