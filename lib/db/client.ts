import { PrismaClient } from './generated/client';
import { adapterFactory, databaseFile } from './sqlite';

export type Db = PrismaClient;

const globalForDb = globalThis as unknown as { plateauDb?: { file: string; client: PrismaClient } };

/** The process-wide Prisma client for the configured database file. */
export function db(): PrismaClient {
  const file = databaseFile();
  if (!globalForDb.plateauDb || globalForDb.plateauDb.file !== file) {
    globalForDb.plateauDb = { file, client: new PrismaClient({ adapter: adapterFactory(file) }) };
  }
  return globalForDb.plateauDb.client;
}

/** A client for an explicit file (tests, scripts). */
export function openDb(file: string): PrismaClient {
  return new PrismaClient({ adapter: adapterFactory(file) });
}
