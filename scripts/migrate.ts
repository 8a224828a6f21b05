/**
 * npm run migrate [-- down|down-all|status]: changes the schema of the database that the
 * embedded default or DATABASE_URL names.
 */
import { createSequelize } from '../server/db';
import { createMigrator } from '../server/migrator';
import { prepareDatabase } from './lib/embedded-db';
import { migrateUp } from './lib/migrate';

const db = await prepareDatabase(process.env.DATA_DIR ?? '.data');
const cmd = process.argv[2] ?? 'up';
try {
  if (cmd === 'up') {
    const applied = await migrateUp(db.ownerUrl, db.appUrl);
    console.log(applied.length ? `Applied: ${applied.join(', ')}` : 'Nothing to apply.');
  } else {
    const owner = createSequelize(db.ownerUrl, { poolMax: 2 });
    const migrator = createMigrator(owner);
    if (cmd === 'status') {
      console.log('Applied:', (await migrator.executed()).map((m) => m.name));
      console.log('Pending:', (await migrator.pending()).map((m) => m.name));
    } else if (cmd === 'down') {
      console.log('Reverted:', (await migrator.down()).map((m) => m.name));
    } else if (cmd === 'down-all') {
      console.log('Reverted:', (await migrator.down({ to: 0 })).map((m) => m.name));
    } else {
      console.error(`Unknown command "${cmd}": use up, down, down-all or status.`);
      process.exitCode = 2;
    }
    await owner.close();
  }
} finally {
  db.cluster?.stop();
}
