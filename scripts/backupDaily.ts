// Daily online backup with retention, alongside the running app (it never stops it):
//   npm run db:backup:daily            long-running: a backup every day at PLATEAU_BACKUP_AT (UTC HH:MM, default 02:30)
//   npm run db:backup:daily -- --once  one backup + pruning now, then exit (for cron / systemd timers)
// Settings: the database (PLATEAU_DATABASE_URL or PLATEAU_DB_FILE), PLATEAU_BACKUP_DIR (default <data folder>/backups), PLATEAU_BACKUP_KEEP (default 14).
// Cron instead of the scheduler:  30 2 * * *  cd /srv/plateau && npm run --silent db:backup:daily -- --once >> /var/log/plateau-backup.log 2>&1
import path from 'node:path';
import { dataDir, databaseTarget, describeTarget } from '../lib/db/target';
import { backupDatabase, pruneBackups } from '../lib/db/backup';

const target = databaseTarget();
const dir = process.env.PLATEAU_BACKUP_DIR ?? path.join(dataDir(), 'backups');
const keep = Math.max(1, Number(process.env.PLATEAU_BACKUP_KEEP ?? 14) || 14);
const at = /^(\d{1,2}):(\d{2})$/.exec(process.env.PLATEAU_BACKUP_AT ?? '02:30');
if (!at || Number(at[1]) > 23 || Number(at[2]) > 59) {
  console.error('PLATEAU_BACKUP_AT must be HH:MM (UTC)');
  process.exit(2);
}

function runOnce(): boolean {
  try {
    const b = backupDatabase(target, dir, new Date());
    const gone = pruneBackups(dir, keep);
    console.log(`${new Date().toISOString()} backup written: ${b.file} (sha256 ${b.sha256}); kept newest ${keep}${gone.length ? `, removed ${gone.length}` : ''}`);
    return true;
  } catch (e) {
    console.error(`${new Date().toISOString()} backup FAILED: ${e instanceof Error ? e.message : String(e)}`);
    return false;
  }
}

/** Milliseconds until the next HH:MM UTC. */
export function msUntilNext(now: Date, hh: number, mm: number): number {
  const next = new Date(Date.UTC(now.getUTCFullYear(), now.getUTCMonth(), now.getUTCDate(), hh, mm));
  if (next.getTime() <= now.getTime()) next.setUTCDate(next.getUTCDate() + 1);
  return next.getTime() - now.getTime();
}

if (process.argv.includes('--once')) {
  process.exit(runOnce() ? 0 : 1);
} else {
  const hh = Number(at[1]);
  const mm = Number(at[2]);
  const schedule = () => {
    const wait = msUntilNext(new Date(), hh, mm);
    console.log(`next backup of ${describeTarget(target)} at ${new Date(Date.now() + wait).toISOString()} into ${dir} (keeping ${keep})`);
    // A timer longer than ~24.8 days overflows; a day is well within.
    setTimeout(() => {
      runOnce();
      schedule();
    }, wait);
  };
  schedule();
  for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => process.exit(0));
}
