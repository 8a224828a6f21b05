import { createSequelize } from '../../server/db';
import { grantAppRole, roleOf } from '../../server/db-roles';
import { createMigrator } from '../../server/migrator';

/** Applies every pending migration as the owner, then grants the app role its narrow rights. */
export async function migrateUp(ownerUrl: string, appUrl: string): Promise<string[]> {
  const owner = createSequelize(ownerUrl, { poolMax: 2 });
  try {
    const applied = await createMigrator(owner).up();
    await grantAppRole(owner, roleOf(appUrl));
    return applied.map((m) => m.name);
  } finally {
    await owner.close();
  }
}
