// Restore: npm run db:restore -- <backup file>. Verifies the checksum and integrity first; keeps the
// current database (SQLite: a copy beside it; PostgreSQL: a dump beside the backup). Stop the app first.
import { databaseTarget, describeTarget } from '../lib/db/target';
import { BackupChecksumError, restoreDatabase } from '../lib/db/backup';

const file = process.argv[2];
if (!file) {
  console.error('usage: npm run db:restore -- <backup file>');
  process.exit(2);
}
const target = databaseTarget();
try {
  const r = restoreDatabase(file, target, new Date());
  console.log(`restored ${file} to ${describeTarget(target)}${r.previous ? ` (previous database kept as ${r.previous})` : ''}`);
} catch (e) {
  if (e instanceof BackupChecksumError) {
    console.error(`refused: ${e.message}`);
    process.exit(2);
  }
  throw e;
}
