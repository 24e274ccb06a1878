import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { applyMigrations, diffSql } from '@/lib/db/schemaEngine';
import { committedMigrationNames } from '@/lib/db/migrationFiles';
import { openRawDatabase } from '@/lib/db/sqlite';

const tmp = () => fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-mig-'));
const isEmptyDiff = (sql: string) => sql.trim() === '' || /^-- This is an empty migration\.?$/.test(sql.trim());

describe('migrations', () => {
  it('apply offline to a new database, and a second run applies nothing', async () => {
    const file = path.join(tmp(), 'fresh.db');
    const first = await applyMigrations(file);
    expect(first).toEqual(committedMigrationNames());
    expect(await applyMigrations(file)).toEqual([]);
  });

  it('leave a freshly migrated database matching schema.prisma (no drift)', async () => {
    const dir = tmp();
    const file = path.join(dir, 'drift.db');
    await applyMigrations(file);
    const fromDb = await diffSql(path.join(dir, 'scratch.db'), { dbFile: file }, 'schema');
    expect(isEmptyDiff(fromDb), `database differs from schema.prisma:\n${fromDb}`).toBe(true);
    const fromHistory = await diffSql(path.join(dir, 'scratch2.db'), 'migrations', 'schema');
    expect(isEmptyDiff(fromHistory), `migrations differ from schema.prisma:\n${fromHistory}`).toBe(true);
  });

  it('open SQLite in WAL with synchronous=FULL, foreign keys on and a busy timeout', async () => {
    const file = path.join(tmp(), 'pragmas.db');
    await applyMigrations(file);
    const db = openRawDatabase(file);
    expect(db.pragma('journal_mode', { simple: true })).toBe('wal');
    expect(db.pragma('synchronous', { simple: true })).toBe(2); // 2 = FULL
    expect(db.pragma('foreign_keys', { simple: true })).toBe(1);
    expect(Number(db.pragma('busy_timeout', { simple: true }))).toBeGreaterThanOrEqual(5000);
    expect(() => db.prepare("INSERT INTO Room (id, unitId, name) VALUES ('r', 'no-such-unit', 'x')").run()).toThrow(/FOREIGN KEY/);
    db.close();
  });
});
