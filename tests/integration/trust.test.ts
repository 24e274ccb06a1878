/**
 * Maintenance through the real scripts, on the database under test: audit:verify names a
 * tampered entry; db:backup takes an online backup with a checksum while writers keep going
 * (SQLite: VACUUM INTO → .db; PostgreSQL: pg_dump → .dump) and db:restore brings it back, or
 * refuses a backup whose checksum does not match and leaves the database alone.
 */
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cloneDatabase, closeTestSql, dropDatabase, makeDatabase, onPostgres, ROOT, testSql, type TestDatabase } from '../helpers/appServer';
import { dbArg, integrityCheck } from '../helpers/db';
import { appendAuditSql } from '@/lib/db/auditSql';
import { verifyAuditChain } from '@/lib/db/auditVerify';

const TSX = path.join(ROOT, 'node_modules', '.bin', 'tsx');
const run = (script: string, args: string[], env: NodeJS.ProcessEnv) => spawnSync(TSX, [path.join(ROOT, 'scripts', script), ...args], { cwd: ROOT, env, encoding: 'utf8' });
/** The same, without blocking this process (so it can write meanwhile). */
const runAsync = (script: string, args: string[], env: NodeJS.ProcessEnv) =>
  new Promise<{ status: number | null; stdout: string; stderr: string }>((resolve) => {
    const child = spawn(TSX, [path.join(ROOT, 'scripts', script), ...args], { cwd: ROOT, env, stdio: ['ignore', 'pipe', 'pipe'] });
    let stdout = '';
    let stderr = '';
    child.stdout.on('data', (x) => (stdout += x));
    child.stderr.on('data', (x) => (stderr += x));
    child.on('close', (status) => resolve({ status, stdout, stderr }));
  });
const BACKUP_EXT = onPostgres ? '.dump' : '.db';

let template: TestDatabase;
const made: TestDatabase[] = [];
beforeAll(() => {
  template = makeDatabase({ cases: 3 });
});
afterAll(async () => {
  for (const d of made) await dropDatabase(d);
  if (template) await dropDatabase(template);
});

let auditN = 0;
/** Appends one audit entry the way the app's bulk writers do (the Sql port, in a transaction). */
const appendOne = (d: TestDatabase, entityId: string, at: Date) =>
  testSql(d).tx((q) => appendAuditSql(q, { at, actorId: 'user-x', role: 'nurse', action: 'create', entity: 'dose', entityId, after: { amount: 10 + auditN++ } }));

/** A fresh copy of the seeded template database, with n more audit entries (entity ids d0…). */
async function withEntries(n: number): Promise<TestDatabase> {
  const d = await cloneDatabase(template);
  made.push(d);
  for (let i = 0; i < n; i++) await appendOne(d, `d${i}`, new Date(Date.UTC(2026, 2, 2, 9, 0, i)));
  return d;
}

const seqOf = async (d: TestDatabase, entityId: string) => (await testSql(d).get<{ seq: number }>('SELECT "seq" FROM "AuditEntry" WHERE "entityId" = ?', [entityId]))!.seq;
const count = async (d: TestDatabase, table: string) => (await testSql(d).get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "${table}"`))!.n;

describe('audit:verify', () => {
  it('passes an untouched chain, on the configured database and when named on the command line', async () => {
    const d = await withEntries(5);
    for (const args of [[], [dbArg(d)]]) {
      const r = run('auditVerify.ts', args, d.env);
      expect(r.status, r.stderr).toBe(0);
      expect(r.stdout).toMatch(/audit trail intact: \d+ entries/);
    }
    expect(await verifyAuditChain(testSql(d))).toEqual({ ok: true, entries: await count(d, 'AuditEntry') });
  });

  it('names the entry whose content was edited', async () => {
    const d = await withEntries(5);
    const target = await seqOf(d, 'd2');
    expect(await testSql(d).run(`UPDATE "AuditEntry" SET "after" = '{"amount":999}' WHERE "seq" = ?`, [target])).toBe(1);
    const r = run('auditVerify.ts', [dbArg(d)], d.env);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`BROKEN at entry ${target}: entry ${target} was changed after it was written`);
  });

  it('names the gap where an entry was deleted', async () => {
    const d = await withEntries(5);
    const target = await seqOf(d, 'd3');
    expect(await testSql(d).run('DELETE FROM "AuditEntry" WHERE "seq" = ?', [target])).toBe(1);
    const r = run('auditVerify.ts', [dbArg(d)], d.env);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`BROKEN at entry ${target}: entry ${target} is missing`);
  });

  it('catches an edited entry whose hash was recomputed, by the broken link to the next one', async () => {
    const d = await withEntries(5);
    const target = await seqOf(d, 'd1');
    expect(await testSql(d).run(`UPDATE "AuditEntry" SET "hash" = 'f00d' || substr("hash", 5) WHERE "seq" = ?`, [target])).toBe(1);
    const r = run('auditVerify.ts', [dbArg(d)], d.env);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(new RegExp(`BROKEN at entry ${target}`));
  });
});

describe('backup and restore', () => {
  it('takes an online backup with a checksum while writers keep going, and restores it', async () => {
    const d = await withEntries(2);
    const dir = path.join(d.dir, 'backups');
    const cases = await count(d, 'Case');
    const auditBefore = await count(d, 'AuditEntry');
    // Writers keep appending audit entries (each its own transaction) for as long as the backup runs.
    const backup = runAsync('dbBackup.ts', [dir], d.env);
    let done = false;
    void backup.then(() => (done = true));
    let written = 0;
    while (!done) {
      await appendOne(d, `load-${written}`, new Date());
      written++;
      await new Promise((r) => setTimeout(r, 5));
    }
    const b = await backup;
    expect(b.status, b.stderr).toBe(0);
    expect(written, 'writes made while the backup ran').toBeGreaterThan(5);
    const auditAfter = await count(d, 'AuditEntry');
    expect(auditAfter).toBe(auditBefore + written);
    const file = path.join(dir, fs.readdirSync(dir).find((f) => f.endsWith(BACKUP_EXT))!);
    expect(fs.readFileSync(`${file}.sha256`, 'utf8')).toMatch(/^[0-9a-f]{64} {2}plateau-/);

    // Damage the derived data, then restore (the app would be stopped: close our connections too).
    await testSql(d).run('DELETE FROM "CaseSummaryRule"');
    await testSql(d).run('DELETE FROM "CaseSummary"');
    expect(await count(d, 'CaseSummary')).toBe(0);
    await closeTestSql(d.target);
    const r = run('dbRestore.ts', [file], d.env);
    expect(r.status, r.stderr).toBe(0);

    expect(await count(d, 'Case')).toBe(cases);
    expect(await count(d, 'CaseSummary')).toBeGreaterThan(0);
    expect(await integrityCheck(d)).toBe('ok');
    // The backup is one consistent snapshot: a whole prefix of the chain, taken while it grew.
    const restored = await count(d, 'AuditEntry');
    expect(restored).toBeGreaterThanOrEqual(auditBefore);
    expect(restored).toBeLessThanOrEqual(auditAfter);
    expect(await verifyAuditChain(testSql(d))).toEqual({ ok: true, entries: restored });
    const v = run('auditVerify.ts', [dbArg(d)], d.env);
    expect(v.status, v.stderr).toBe(0);
    console.log(`backup under load (${onPostgres ? 'postgresql' : 'sqlite'}): ${written} audit entries written while it ran; the backup holds ${restored - auditBefore} of them`);
  });

  it('refuses a backup whose checksum does not match, and leaves the database alone', async () => {
    const d = await withEntries(1);
    const dir = path.join(d.dir, 'backups');
    const b = run('dbBackup.ts', [dir], d.env);
    expect(b.status, b.stderr).toBe(0);
    const file = path.join(dir, fs.readdirSync(dir).find((f) => f.endsWith(BACKUP_EXT))!);
    fs.appendFileSync(file, 'x');
    // A change made after the backup: a restore would take it away.
    await appendOne(d, 'after-backup', new Date());
    const audit = await count(d, 'AuditEntry');
    await closeTestSql(d.target);
    const stat = d.dbFile ? fs.statSync(d.dbFile).mtimeMs : 0;
    const r = run('dbRestore.ts', [file], d.env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/refused: checksum mismatch/);
    if (d.dbFile) expect(fs.statSync(d.dbFile).mtimeMs, 'the SQLite file was not touched').toBe(stat);
    expect(await count(d, 'AuditEntry')).toBe(audit);
    expect(await seqOf(d, 'after-backup')).toBe(audit);
    expect((await verifyAuditChain(testSql(d))).ok).toBe(true);
  });
});
