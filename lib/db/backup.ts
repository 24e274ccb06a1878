import { createHash } from 'node:crypto';
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { openRawDatabase } from './sqlite';

/** SHA-256 of a file, hex. */
export function fileSha256(file: string): string {
  return createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

/**
 * A consistent online backup with SQLite's `VACUUM INTO` (a snapshot of one read transaction,
 * so writers keep going), written to `<dir>/plateau-<stamp>.db` with a `.sha256` beside it.
 */
export function backupDatabase(dbFile: string, dir: string, now: Date): { file: string; sha256: string } {
  fs.mkdirSync(dir, { recursive: true });
  const stamp = now.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');
  const file = path.join(dir, `plateau-${stamp}.db`);
  const raw = openRawDatabase(dbFile);
  try {
    raw.prepare('VACUUM INTO ?').run(file);
  } finally {
    raw.close();
  }
  const sha256 = fileSha256(file);
  fs.writeFileSync(`${file}.sha256`, `${sha256}  ${path.basename(file)}\n`);
  return { file, sha256 };
}

export class BackupChecksumError extends Error {}

/**
 * Restores a backup over the database file after checking its checksum and integrity. The
 * current database is kept beside it as `<file>.before-restore-<stamp>`. Stop the app first.
 */
export function restoreDatabase(backupFile: string, dbFile: string, now: Date): { previous: string | null } {
  const sumFile = `${backupFile}.sha256`;
  if (!fs.existsSync(sumFile)) throw new BackupChecksumError(`${sumFile} is missing: cannot verify the backup`);
  const expected = fs.readFileSync(sumFile, 'utf8').trim().split(/\s+/)[0];
  const actual = fileSha256(backupFile);
  if (expected !== actual) throw new BackupChecksumError(`checksum mismatch: ${path.basename(backupFile)} is ${actual}, expected ${expected}`);
  const check = new Database(backupFile, { readonly: true });
  const ok = check.pragma('integrity_check', { simple: true });
  check.close();
  if (ok !== 'ok') throw new BackupChecksumError(`integrity check failed on the backup: ${ok}`);
  let previous: string | null = null;
  if (fs.existsSync(dbFile)) {
    previous = `${dbFile}.before-restore-${now.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z')}`;
    // Fold the WAL into the main file first so the kept copy is complete.
    const cur = openRawDatabase(dbFile);
    cur.pragma('wal_checkpoint(TRUNCATE)');
    cur.close();
    fs.copyFileSync(dbFile, previous);
  }
  for (const ext of ['-wal', '-shm']) fs.rmSync(dbFile + ext, { force: true });
  fs.copyFileSync(backupFile, dbFile);
  return { previous };
}

/** Deletes backups in `dir` beyond the newest `keep`. */
export function pruneBackups(dir: string, keep: number): string[] {
  if (!fs.existsSync(dir)) return [];
  const files = fs.readdirSync(dir).filter((f) => /^plateau-\d{8}T\d{6}Z\.db$/.test(f)).sort().reverse();
  const gone = files.slice(keep);
  for (const f of gone) {
    fs.rmSync(path.join(dir, f), { force: true });
    fs.rmSync(path.join(dir, `${f}.sha256`), { force: true });
  }
  return gone;
}
