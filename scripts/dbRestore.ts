// Restore: npm run db:restore -- <backup file>. Verifies the checksum and integrity first; keeps the current database beside it.
import { databaseFile } from '../lib/db/sqlite';
import { BackupChecksumError, restoreDatabase } from '../lib/db/backup';

const file = process.argv[2];
if (!file) {
  console.error('usage: npm run db:restore -- <backup file>');
  process.exit(2);
}
try {
  const r = restoreDatabase(file, databaseFile(), new Date());
  console.log(`restored ${file} to ${databaseFile()}${r.previous ? ` (previous database kept as ${r.previous})` : ''}`);
} catch (e) {
  if (e instanceof BackupChecksumError) {
    console.error(`refused: ${e.message}`);
    process.exit(2);
  }
  throw e;
}
