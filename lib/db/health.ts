import type { PrismaClient } from './generated/client';
import { committedMigrationNames } from './migrationFiles';

/** Database reachable, and every committed migration recorded as finished. */
export async function databaseHealth(client: PrismaClient) {
  try {
    const rows = await client.$queryRawUnsafe<{ migration_name: string }[]>(
      'SELECT migration_name FROM _prisma_migrations WHERE finished_at IS NOT NULL AND rolled_back_at IS NULL',
    );
    const applied = new Set(rows.map((r) => r.migration_name));
    const pending = committedMigrationNames().filter((m) => !applied.has(m));
    return { database: 'reachable' as const, migrations: pending.length ? ('pending' as const) : ('current' as const), pending };
  } catch (e) {
    return { database: 'unreachable' as const, migrations: 'unknown' as const, pending: [], error: e instanceof Error ? e.message.split('\n')[0] : 'unknown' };
  }
}
