/**
 * Online backups with a checksum, and verified restores, for both databases:
 * - SQLite: `VACUUM INTO` (a snapshot of one read transaction, so writers keep going) to
 *   `plateau-<stamp>.db`; a restore checks the checksum and `PRAGMA integrity_check` first.
 * - PostgreSQL: `pg_dump --format=custom` (one repeatable-read snapshot, writers keep going) to
 *   `plateau-<stamp>.dump`; a restore checks the checksum and that `pg_restore --list` can read
 *   the archive, dumps the current database beside it, then restores in one transaction.
 * Each backup gets a `<file>.sha256` beside it.
 */
import { createHash } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import Database from 'better-sqlite3';
import { openRawDatabase } from './sqlite';
import { asTarget, type DbTarget } from './target';

/** SHA-256 of a file, hex. */
export function fileSha256(file: string): string {
  return createHash('sha256').update(fs.readFileSync(file)).digest('hex');
}

const stampOf = (now: Date) => now.toISOString().replace(/[-:]/g, '').replace(/\.\d+Z$/, 'Z');

function writeChecksum(file: string): string {
  const sha256 = fileSha256(file);
  fs.writeFileSync(`${file}.sha256`, `${sha256}  ${path.basename(file)}\n`);
  return sha256;
}

export class BackupChecksumError extends Error {}

function verifyChecksum(backupFile: string): void {
  const sumFile = `${backupFile}.sha256`;
  if (!fs.existsSync(sumFile)) throw new BackupChecksumError(`${sumFile} is missing: cannot verify the backup`);
  const expected = fs.readFileSync(sumFile, 'utf8').trim().split(/\s+/)[0];
  const actual = fileSha256(backupFile);
  if (expected !== actual) throw new BackupChecksumError(`checksum mismatch: ${path.basename(backupFile)} is ${actual}, expected ${expected}`);
}

/** A consistent online backup of the database into `dir`; returns the file and its SHA-256. */
export function backupDatabase(target: DbTarget | string, dir: string, now: Date): { file: string; sha256: string } {
  fs.mkdirSync(dir, { recursive: true });
  const t = asTarget(target);
  if (t.dialect === 'postgresql') {
    const file = path.join(dir, `plateau-${stampOf(now)}.dump`);
    pgTool('pg_dump', ['--format=custom', '--no-owner', '--file', file, '--dbname', t.url]);
    return { file, sha256: writeChecksum(file) };
  }
  const file = path.join(dir, `plateau-${stampOf(now)}.db`);
  const raw = openRawDatabase(t.file);
  try {
    raw.prepare('VACUUM INTO ?').run(file);
  } finally {
    raw.close();
  }
  return { file, sha256: writeChecksum(file) };
}

/**
 * Restores a backup over the database after checking its checksum and integrity. The current
 * database is kept: SQLite as `<file>.before-restore-<stamp>`, PostgreSQL as a dump of it in
 * the backup's folder (`plateau-before-restore-<stamp>.dump`). Stop the app first.
 */
export function restoreDatabase(backupFile: string, target: DbTarget | string, now: Date): { previous: string | null } {
  const t = asTarget(target);
  verifyChecksum(backupFile);
  if (t.dialect === 'postgresql') {
    const list = pgTool('pg_restore', ['--list', backupFile], { check: false });
    if (list.status !== 0) throw new BackupChecksumError(`the backup is not a readable PostgreSQL archive: ${list.stderr.trim().split('\n')[0]}`);
    const previous = path.join(path.dirname(backupFile), `plateau-before-restore-${stampOf(now)}.dump`);
    pgTool('pg_dump', ['--format=custom', '--no-owner', '--file', previous, '--dbname', t.url]);
    writeChecksum(previous);
    pgTool('pg_restore', ['--clean', '--if-exists', '--no-owner', '--single-transaction', '--exit-on-error', '--dbname', t.url, backupFile]);
    return { previous };
  }
  const check = new Database(backupFile, { readonly: true });
  const ok = check.pragma('integrity_check', { simple: true });
  check.close();
  if (ok !== 'ok') throw new BackupChecksumError(`integrity check failed on the backup: ${ok}`);
  let previous: string | null = null;
  if (fs.existsSync(t.file)) {
    previous = `${t.file}.before-restore-${stampOf(now)}`;
    // Fold the WAL into the main file first so the kept copy is complete.
    const cur = openRawDatabase(t.file);
    cur.pragma('wal_checkpoint(TRUNCATE)');
    cur.close();
    fs.copyFileSync(t.file, previous);
  }
  for (const ext of ['-wal', '-shm']) fs.rmSync(t.file + ext, { force: true });
  fs.copyFileSync(backupFile, t.file);
  return { previous };
}

/** Deletes backups in `dir` beyond the newest `keep` (restore safety copies are kept). */
export function pruneBackups(dir: string, keep: number): string[] {
  if (!fs.existsSync(dir)) return [];
  const files = fs.readdirSync(dir).filter((f) => /^plateau-\d{8}T\d{6}Z\.(db|dump)$/.test(f)).sort().reverse();
  const gone = files.slice(keep);
  for (const f of gone) {
    fs.rmSync(path.join(dir, f), { force: true });
    fs.rmSync(path.join(dir, `${f}.sha256`), { force: true });
  }
  return gone;
}

/** A PostgreSQL client program: on PATH, or in PLATEAU_PG_BIN / Debian's newest /usr/lib/postgresql/<v>/bin. */
function pgTool(name: 'pg_dump' | 'pg_restore', args: string[], opts: { check?: boolean } = {}) {
  const dirs = [process.env.PLATEAU_PG_BIN, ...newestDebianBin()].filter((d): d is string => !!d);
  const bin = dirs.map((d) => path.join(d, name)).find((p) => fs.existsSync(p)) ?? name;
  const r = spawnSync(bin, args, { encoding: 'utf8' });
  if (r.error) throw new Error(`${name} could not run (${r.error.message}); install PostgreSQL's client programs (Debian: postgresql-client) or set PLATEAU_PG_BIN`);
  if (opts.check !== false && r.status !== 0) throw new Error(`${name} failed: ${r.stderr.trim()}`);
  return r;
}

function newestDebianBin(): string[] {
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return [];
  return fs
    .readdirSync(base)
    .filter((v) => /^\d+$/.test(v))
    .sort((a, b) => Number(b) - Number(a))
    .map((v) => path.join(base, v, 'bin'));
}
