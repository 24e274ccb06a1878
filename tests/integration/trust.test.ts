import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import os from 'node:os';
import { beforeAll, describe, expect, it } from 'vitest';
import { makeDatabase, ROOT } from '../helpers/appServer';
import { openRawDatabase } from '@/lib/db/sqlite';
import { appendAuditRaw } from '@/lib/db/auditRaw';

const TSX = path.join(ROOT, 'node_modules', '.bin', 'tsx');
const run = (script: string, args: string[], env: NodeJS.ProcessEnv) => spawnSync(TSX, [path.join(ROOT, 'scripts', script), ...args], { cwd: ROOT, env, encoding: 'utf8' });

let template: ReturnType<typeof makeDatabase>;
beforeAll(() => {
  template = makeDatabase({ cases: 3 });
});

/** A fresh copy of the seeded template database, with n more audit entries. */
function withEntries(n: number) {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-trust-'));
  const dbFile = path.join(dir, 'plateau.db');
  const t = openRawDatabase(template.dbFile);
  t.prepare('VACUUM INTO ?').run(dbFile);
  t.close();
  const d = { dir, dbFile, env: { ...template.env, PLATEAU_DB_FILE: dbFile } };
  const raw = openRawDatabase(d.dbFile);
  for (let i = 0; i < n; i++) appendAuditRaw(raw, { at: new Date(Date.UTC(2026, 2, 2, 9, 0, i)), actorId: 'user-x', role: 'nurse', action: 'create', entity: 'dose', entityId: `d${i}`, after: { amount: 10 + i } });
  raw.close();
  return d;
}

describe('audit:verify', () => {
  it('passes an untouched chain', () => {
    const d = withEntries(5);
    const r = run('auditVerify.ts', [], d.env);
    expect(r.status, r.stderr).toBe(0);
    expect(r.stdout).toMatch(/audit trail intact: \d+ entries/);
  });

  it('names the entry whose content was edited', () => {
    const d = withEntries(5);
    const raw = openRawDatabase(d.dbFile);
    const target = (raw.prepare("SELECT seq FROM AuditEntry WHERE entityId = 'd2'").get() as { seq: number }).seq;
    raw.prepare("UPDATE AuditEntry SET after = '{\"amount\":999}' WHERE seq = ?").run(target);
    raw.close();
    const r = run('auditVerify.ts', [], d.env);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`BROKEN at entry ${target}: entry ${target} was changed after it was written`);
  });

  it('names the gap where an entry was deleted', () => {
    const d = withEntries(5);
    const raw = openRawDatabase(d.dbFile);
    const target = (raw.prepare("SELECT seq FROM AuditEntry WHERE entityId = 'd3'").get() as { seq: number }).seq;
    raw.prepare('DELETE FROM AuditEntry WHERE seq = ?').run(target);
    raw.close();
    const r = run('auditVerify.ts', [], d.env);
    expect(r.status).toBe(1);
    expect(r.stderr).toContain(`BROKEN at entry ${target}: entry ${target} is missing`);
  });

  it('catches an edited entry whose hash was recomputed, by the broken link to the next one', () => {
    const d = withEntries(5);
    const raw = openRawDatabase(d.dbFile);
    const target = (raw.prepare("SELECT seq FROM AuditEntry WHERE entityId = 'd1'").get() as { seq: number }).seq;
    raw.prepare("UPDATE AuditEntry SET hash = 'f00d' || substr(hash, 5) WHERE seq = ?").run(target);
    raw.close();
    const r = run('auditVerify.ts', [], d.env);
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(new RegExp(`BROKEN at entry ${target}`));
  });
});

describe('backup and restore', () => {
  it('takes an online backup with a checksum and restores it', () => {
    const d = withEntries(2);
    const dir = path.join(d.dir, 'backups');
    const b = run('dbBackup.ts', [dir], d.env);
    expect(b.status, b.stderr).toBe(0);
    const file = path.join(dir, fs.readdirSync(dir).find((f) => f.endsWith('.db'))!);
    expect(fs.readFileSync(`${file}.sha256`, 'utf8')).toMatch(/^[0-9a-f]{64} {2}plateau-/);
    const count = () => {
      const raw = openRawDatabase(d.dbFile);
      const n = (raw.prepare('SELECT COUNT(*) AS n FROM "Case"').get() as { n: number }).n;
      raw.close();
      return n;
    };
    const before = count();
    const raw = openRawDatabase(d.dbFile);
    raw.prepare('DELETE FROM CaseSummaryRule').run();
    raw.prepare('DELETE FROM CaseSummary').run();
    raw.close();
    const r = run('dbRestore.ts', [file], d.env);
    expect(r.status, r.stderr).toBe(0);
    expect(count()).toBe(before);
    const after = openRawDatabase(d.dbFile);
    expect((after.prepare('SELECT COUNT(*) AS n FROM CaseSummary').get() as { n: number }).n).toBeGreaterThan(0);
    expect(after.pragma('integrity_check', { simple: true })).toBe('ok');
    after.close();
  });

  it('refuses a backup whose checksum does not match, and leaves the database alone', () => {
    const d = withEntries(1);
    const dir = path.join(d.dir, 'backups');
    run('dbBackup.ts', [dir], d.env);
    const file = path.join(dir, fs.readdirSync(dir).find((f) => f.endsWith('.db'))!);
    fs.appendFileSync(file, 'x');
    const stat = fs.statSync(d.dbFile).mtimeMs;
    const r = run('dbRestore.ts', [file], d.env);
    expect(r.status).toBe(2);
    expect(r.stderr).toMatch(/refused: checksum mismatch/);
    expect(fs.statSync(d.dbFile).mtimeMs).toBe(stat);
  });
});
