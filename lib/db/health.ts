import type { PrismaClient } from './generated/client';
import { committedMigrationNames } from './migrationFiles';
import { sqlOf } from './client';

// The committed migrations do not change while the app runs: read the folder once per database kind.
const committed = new Map<string, string[]>();

/** Database reachable, and every committed migration recorded as finished. */
export async function databaseHealth(client: PrismaClient) {
  try {
    const q = sqlOf(client);
    const rows = await q.all<{ migration_name: string }>('SELECT "migration_name" FROM "_prisma_migrations" WHERE "finished_at" IS NOT NULL AND "rolled_back_at" IS NULL');
    const applied = new Set(rows.map((r) => r.migration_name));
    if (!committed.has(q.dialect)) committed.set(q.dialect, committedMigrationNames(q.dialect));
    const pending = committed.get(q.dialect)!.filter((m) => !applied.has(m));
    return { database: 'reachable' as const, dialect: q.dialect, migrations: pending.length ? ('pending' as const) : ('current' as const), pending };
  } catch (e) {
    return { database: 'unreachable' as const, migrations: 'unknown' as const, pending: [], error: e instanceof Error ? e.message.split('\n')[0] : 'unknown' };
  }
}
