// Applies committed migrations (prisma/migrations) to the database file, offline.
import { applyMigrations } from '../lib/db/schemaEngine';
import { databaseFile } from '../lib/db/sqlite';

const file = databaseFile();
applyMigrations(file)
  .then((names) => {
    console.log(names.length ? `migrated ${file}: ${names.join(', ')}` : `database ${file} is up to date`);
  })
  .catch((e) => {
    console.error(`migration failed for ${file}:`, e instanceof Error ? e.message : e);
    process.exit(1);
  });
