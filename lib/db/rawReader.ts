import type Database from 'better-sqlite3';
import type { PrismaClient } from './generated/client';
import { openRawDatabase } from './sqlite';

const globalForRaw = globalThis as unknown as { plateauStatsRaw?: Map<string, Database.Database> };
const fileOfClient = new WeakMap<PrismaClient, string>();

/**
 * A raw read connection to the same file as `client` (PRAGMA database_list names it), kept
 * open per file: better-sqlite3 reads rows an order of magnitude faster than the ORM, and in
 * WAL mode a long-lived reader sees every commit at the start of each statement.
 */
export async function rawFor(client: PrismaClient): Promise<Database.Database> {
  let file = fileOfClient.get(client);
  if (!file) {
    const list = await client.$queryRawUnsafe<{ name: string; file: string }[]>('PRAGMA database_list');
    file = list.find((d) => d.name === 'main')?.file;
    if (!file) throw new Error('rawFor: the database has no file (in-memory databases are not supported)');
    fileOfClient.set(client, file);
  }
  const cache = (globalForRaw.plateauStatsRaw ??= new Map());
  let raw = cache.get(file);
  if (!raw || !raw.open) {
    raw = openRawDatabase(file);
    cache.set(file, raw);
  }
  return raw;
}
