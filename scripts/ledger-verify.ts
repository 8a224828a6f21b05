/**
 * npm run ledger:verify: recomputes every event hash, chain link, item head and daily seal of
 * the ledger that the embedded default or DATABASE_URL names; prints the report and exits 1 at
 * the first break.
 */
import { verifyLedger } from '../server/commands/verify-ledger';
import { runLedgerScript } from './lib/ledger-script';

await runLedgerScript(async (sequelize) => {
  const started = Date.now();
  const report = await verifyLedger(sequelize);
  console.log(JSON.stringify(report, null, 2));
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  if (report.ok) {
    console.log(`Ledger verified: ${report.eventsChecked} events and ${report.sealsChecked} seals, no break (${seconds} s).`);
  } else {
    console.log(`LEDGER BREAK: ${report.firstBreak?.message}`);
  }
  return report.ok;
});
