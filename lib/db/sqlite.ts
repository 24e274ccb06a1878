/**
 * SQLite connection settings in one place (architecture: anything SQLite-specific sits here).
 * WAL for concurrent readers, synchronous=FULL so an acknowledged write survives power loss,
 * foreign keys on, and a busy timeout so a second writer waits instead of failing.
 */
import path from 'node:path';
import Database from 'better-sqlite3';
import { PrismaBetterSqlite3 } from '@prisma/adapter-better-sqlite3';
import type { SqlDriverAdapter, SqlMigrationAwareDriverAdapterFactory } from '@prisma/driver-adapter-utils';

export const BUSY_TIMEOUT_MS = 10_000;
// journal_mode is persistent in the file and needs the database to itself, so it is set once
// (ensureWal) and per-connection pragmas are applied on every open.
export const PRAGMAS = ['synchronous = FULL', 'foreign_keys = ON', `busy_timeout = ${BUSY_TIMEOUT_MS}`];

/** The database file: PLATEAU_DB_FILE, default ./data/plateau.db. */
export function databaseFile(env: NodeJS.ProcessEnv = process.env): string {
  return path.resolve(/*turbopackIgnore: true*/ env.PLATEAU_DB_FILE ?? path.join('data', 'plateau.db'));
}

/** A raw better-sqlite3 handle with Plateau's pragmas, for bulk sample writes and checks. */
export function openRawDatabase(file: string = databaseFile()): Database.Database {
  const db = new Database(file, { timeout: BUSY_TIMEOUT_MS });
  if (db.pragma('journal_mode', { simple: true }) !== 'wal') db.pragma('journal_mode = WAL');
  for (const p of PRAGMAS) db.pragma(p);
  return db;
}

/** Puts a database file in WAL mode (persistent); call before other connections open. */
export function ensureWal(file: string): void {
  openRawDatabase(file).close();
}

/** A Prisma adapter factory whose connections run Plateau's pragmas first. */
export function adapterFactory(file: string = databaseFile()): SqlMigrationAwareDriverAdapterFactory {
  const inner = new PrismaBetterSqlite3({ url: `file:${file}`, timeout: BUSY_TIMEOUT_MS });
  const withPragmas = async (a: SqlDriverAdapter) => {
    const mode = await a.queryRaw({ sql: 'PRAGMA journal_mode', args: [], argTypes: [] });
    if (String(mode.rows[0]?.[0]).toLowerCase() !== 'wal') await a.queryRaw({ sql: 'PRAGMA journal_mode = WAL', args: [], argTypes: [] });
    for (const p of PRAGMAS) await a.queryRaw({ sql: `PRAGMA ${p}`, args: [], argTypes: [] });
    return a;
  };
  return {
    provider: inner.provider,
    adapterName: inner.adapterName,
    connect: async () => withPragmas(await inner.connect()),
    connectToShadowDb: () => inner.connectToShadowDb(),
  };
}

/** An instant as Prisma stores DateTime in SQLite text columns, for raw bulk writes. */
export function isoDb(d: Date): string {
  return d.toISOString().replace('Z', '+00:00');
}
