/**
 * The committed migrations of the database under test (prisma/migrations/<dialect>): they apply
 * offline to a new database, once; the database they make equals schema.prisma, and so does the
 * committed history replayed on its own.
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { afterEach, describe, expect, it } from 'vitest';
import { applyMigrations, diffSql, isEmptyDiff } from '@/lib/db/schemaEngine';
import { committedMigrationNames } from '@/lib/db/migrationFiles';
import { dropDatabase, newTarget, onPostgres, TEST_DIALECT, testSql, type TestDatabase } from '../helpers/appServer';

const made: TestDatabase[] = [];
/** A new empty database of the dialect under test (dropped after each test). */
function fresh(): TestDatabase {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-mig-'));
  const target = newTarget(dir);
  const d: TestDatabase = { dir, dbFile: target.dialect === 'sqlite' ? target.file : '', target, env: { ...process.env } };
  made.push(d);
  return d;
}
afterEach(async () => {
  for (const d of made.splice(0)) await dropDatabase(d);
});

describe(`migrations (${TEST_DIALECT})`, () => {
  it('apply offline to a new database, and a second run applies nothing', async () => {
    const { target } = fresh();
    const committed = committedMigrationNames(TEST_DIALECT);
    expect(committed.length).toBeGreaterThan(0);
    expect(await applyMigrations(target)).toEqual(committed);
    expect(await applyMigrations(target)).toEqual([]);
    const applied = await testSql(target).all<{ name: string }>('SELECT "migration_name" AS "name" FROM "_prisma_migrations" WHERE "finished_at" IS NOT NULL ORDER BY "migration_name"');
    expect(applied.map((r) => r.name)).toEqual(committed);
  });

  it('leave a freshly migrated database matching schema.prisma, and the committed history matches it too (no drift)', async () => {
    const { target } = fresh();
    await applyMigrations(target);
    const fromDb = await diffSql(target, 'database', 'schema');
    expect(isEmptyDiff(fromDb), `database differs from schema.prisma:\n${fromDb}`).toBe(true);
    // The history is replayed on a shadow database; the target is a scratch one, as db:diff does.
    const fromHistory = await diffSql(fresh().target, 'migrations', 'schema');
    expect(isEmptyDiff(fromHistory), `the ${TEST_DIALECT} migrations differ from schema.prisma:\n${fromHistory}`).toBe(true);
  });

  // Per-connection settings exist on SQLite only; PostgreSQL's durability is the server's (fsync, synchronous_commit).
  it.skipIf(onPostgres)('open SQLite in WAL with synchronous=FULL, foreign keys on and a busy timeout', async () => {
    const { target } = fresh();
    await applyMigrations(target);
    const q = testSql(target);
    expect(await q.get('PRAGMA journal_mode')).toEqual({ journal_mode: 'wal' });
    expect(await q.get('PRAGMA synchronous')).toEqual({ synchronous: 2 }); // 2 = FULL
    expect(await q.get('PRAGMA foreign_keys')).toEqual({ foreign_keys: 1 });
    expect((await q.get<{ timeout: number }>('PRAGMA busy_timeout'))!.timeout).toBeGreaterThanOrEqual(5000);
  });

  // The PostgreSQL counterpart: durability is the server's (Plateau relies on its defaults), and
  // writers queue on Plateau's advisory write lock (lib/db/postgres.ts) instead of failing.
  it.runIf(onPostgres)('on PostgreSQL commit durably (fsync, synchronous_commit on), and a second writer waits for the first instead of failing', async () => {
    const { target } = fresh();
    await applyMigrations(target);
    const q = testSql(target);
    expect(await q.get('SHOW fsync')).toEqual({ fsync: 'on' });
    expect(await q.get('SHOW synchronous_commit')).toEqual({ synchronous_commit: 'on' });
    const order: string[] = [];
    const first = q.tx(async () => {
      order.push('first in');
      await new Promise((r) => setTimeout(r, 300));
      order.push('first out');
    });
    await new Promise((r) => setTimeout(r, 50));
    const second = q.tx(async () => {
      order.push('second in');
    });
    await Promise.all([first, second]);
    expect(order).toEqual(['first in', 'first out', 'second in']);
  });

  it('refuse a row whose foreign key points nowhere', async () => {
    const { target } = fresh();
    await applyMigrations(target);
    await expect(testSql(target).run(`INSERT INTO "Room" ("id", "unitId", "name") VALUES ('r', 'no-such-unit', 'x')`)).rejects.toThrow(/FOREIGN KEY|foreign key/);
  });
});
