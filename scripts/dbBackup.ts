// Online backup: npm run db:backup [-- <dir>] (default: <database folder>/backups; PLATEAU_BACKUP_KEEP, default 14).
import path from 'node:path';
import { databaseFile } from '../lib/db/sqlite';
import { backupDatabase, pruneBackups } from '../lib/db/backup';

const db = databaseFile();
const dir = process.argv[2] ?? process.env.PLATEAU_BACKUP_DIR ?? path.join(path.dirname(db), 'backups');
const b = backupDatabase(db, dir, new Date());
const gone = pruneBackups(dir, Number(process.env.PLATEAU_BACKUP_KEEP ?? 14));
console.log(`backup written: ${b.file} (sha256 ${b.sha256})${gone.length ? `; removed ${gone.length} old backup(s)` : ''}`);
