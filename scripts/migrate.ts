// Applies the committed migrations of the configured database (prisma/migrations/<dialect>), offline.
import { applyMigrations } from '../lib/db/schemaEngine';
import { databaseTarget, describeTarget } from '../lib/db/target';

const target = databaseTarget();
const where = describeTarget(target);
applyMigrations(target)
  .then((names) => {
    console.log(names.length ? `migrated ${where}: ${names.join(', ')}` : `database ${where} is up to date`);
  })
  .catch((e) => {
    console.error(`migration failed for ${where}:`, e instanceof Error ? e.message : e);
    process.exit(1);
  });
