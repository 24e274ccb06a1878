/**
 * The Prisma client and the Sql port of the configured database (lib/db/target.ts). Both
 * databases have their own generated client (lib/db/generated for SQLite, lib/db/generated-pg for
 * PostgreSQL, from the one prisma/schema.prisma); they have the same models, so the rest of the
 * code is typed against the SQLite one and never asks which it has — except through
 * `dialectOf` where SQL differs.
 */
import { PrismaClient } from './generated/client';
import { PrismaClient as PgPrismaClient } from './generated-pg/client';
import { adapterFactory, SqliteSql } from './sqlite';
import { PgSql, pgAdapter } from './postgres';
import { asTarget, databaseTarget, targetKey, type DbTarget } from './target';
import type { Dialect, Sql } from './sql';

export type Db = PrismaClient;

// On globalThis, like the client itself: Next bundles this module into several server chunks,
// and a client made by one chunk's copy must find its port from another's.
const globalForDb = globalThis as unknown as { plateauDb?: { key: string; client: PrismaClient; sql: Sql }; plateauDbPorts?: WeakMap<PrismaClient, Sql> };
const ports = (globalForDb.plateauDbPorts ??= new WeakMap<PrismaClient, Sql>());

function create(target: DbTarget): { client: PrismaClient; sql: Sql } {
  if (target.dialect === 'sqlite') {
    const adapter = adapterFactory(target.file);
    const client = new PrismaClient({ adapter });
    // The port writes on the client's own connection (lib/db/sqlite.ts explains why).
    const sql = new SqliteSql(target.file, async () => {
      await client.$connect();
      return adapter.writer();
    });
    ports.set(client, sql);
    return { client, sql };
  }
  // Same models, same API: the PostgreSQL client stands in for the SQLite-typed one.
  const sql = new PgSql(target.url);
  const client = new PgPrismaClient({ adapter: pgAdapter(sql.pool) }) as unknown as PrismaClient;
  ports.set(client, sql);
  return { client, sql };
}

function processWide(): { client: PrismaClient; sql: Sql } {
  const target = databaseTarget();
  const key = targetKey(target);
  if (!globalForDb.plateauDb || globalForDb.plateauDb.key !== key) globalForDb.plateauDb = { key, ...create(target) };
  return globalForDb.plateauDb;
}

/** The process-wide Prisma client for the configured database. */
export function db(): PrismaClient {
  return processWide().client;
}

/** The process-wide Sql port for the configured database. */
export function sql(): Sql {
  return processWide().sql;
}

/**
 * A client for an explicit database (tests, scripts): a SQLite file path, a PostgreSQL URL or a
 * target. Close it with `closeDb`.
 */
export function openDb(target: DbTarget | string): PrismaClient {
  return create(asTarget(target)).client;
}

/** The Sql port that goes with a client (same database). */
export function sqlOf(client: PrismaClient): Sql {
  const s = ports.get(client);
  if (!s) throw new Error('sqlOf: this client was not made by lib/db/client');
  return s;
}

/** Which database a client is on. */
export function dialectOf(client: PrismaClient): Dialect {
  return sqlOf(client).dialect;
}

/** Disconnects a client made by `openDb` and closes its Sql port. */
export async function closeDb(client: PrismaClient): Promise<void> {
  await client.$disconnect();
  await ports.get(client)?.close();
}
