/**
 * npm run ledger:rebuild: replays every item's events through the state machine into a temporary
 * scratch table, compares it in SQL with the stored projections, prints each difference, and
 * exits 1 if there is any. Runs as the application role, in one read-only snapshot; nothing
 * stored is changed and the scratch table goes with the transaction.
 */
import { rebuildProjections } from '../server/commands/rebuild-projections';
import { runLedgerScript } from './lib/ledger-script';

await runLedgerScript(async (sequelize) => {
  const started = Date.now();
  const report = await rebuildProjections(sequelize);
  for (const d of report.differences) {
    console.log(`${d.item} ${d.field}: stored ${JSON.stringify(d.stored)}, rebuilt ${JSON.stringify(d.rebuilt)}`);
  }
  const seconds = ((Date.now() - started) / 1000).toFixed(1);
  console.log(`Rebuilt ${report.itemsChecked} items from ${report.eventsReplayed} events in ${seconds} s: ${report.differences.length} difference(s).`);
  return report.differences.length === 0;
});
