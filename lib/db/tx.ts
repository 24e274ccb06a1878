import type { PrismaClient } from './generated/client';
import { dialectOf } from './client';
import { WRITE_LOCK_SQL } from './postgres';

export type Tx = Parameters<Parameters<PrismaClient['$transaction']>[0]>[0];

/**
 * A Prisma write transaction serialised with every other Plateau writer: on PostgreSQL it takes
 * the write lock first (lib/db/postgres.ts explains why); SQLite serialises writers itself.
 * Use it for every transaction that writes, so read-check-write inside it is safe.
 *
 * @example
 * await writeTx(client, async (tx) => { const c = await tx.case.findUnique(…); … await appendAudit(tx, …); });
 */
export function writeTx<T>(client: PrismaClient, fn: (tx: Tx) => Promise<T>, opts?: { timeout?: number; maxWait?: number }): Promise<T> {
  const pg = dialectOf(client) === 'postgresql';
  return client.$transaction(async (tx) => {
    if (pg) await tx.$executeRawUnsafe(WRITE_LOCK_SQL);
    return fn(tx);
  }, opts);
}
