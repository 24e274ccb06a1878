// Online backup: npm run db:backup [-- <dir>] (default: PLATEAU_BACKUP_DIR, else <data folder>/backups;
// PLATEAU_BACKUP_KEEP, default 14). SQLite: VACUUM INTO; PostgreSQL: pg_dump (lib/db/backup.ts).
import path from 'node:path';
import { dataDir, databaseTarget } from '../lib/db/target';
import { backupDatabase, pruneBackups } from '../lib/db/backup';

const target = databaseTarget();
const dir = process.argv[2] ?? process.env.PLATEAU_BACKUP_DIR ?? path.join(dataDir(), 'backups');
const b = backupDatabase(target, dir, new Date());
const gone = pruneBackups(dir, Number(process.env.PLATEAU_BACKUP_KEEP ?? 14));
console.log(`backup written: ${b.file} (sha256 ${b.sha256})${gone.length ? `; removed ${gone.length} old backup(s)` : ''}`);
