/**
 * Durability: a server process takes a burst of bedside writes, is killed with SIGKILL in the
 * middle of it, and restarts on the same database. Every write it acknowledged (2xx) is there,
 * the audit chain verifies, and the database's own check passes: SQLite's integrity check on
 * the file (WAL + synchronous=FULL: a commit is on disk before the answer is sent); on
 * PostgreSQL the app server dies while the database server stays up, so the check is that the
 * database answers and, with amcheck, its indexes and tables verify (tests/helpers/db.ts).
 * A power cut beyond SIGKILL is not simulated here; docs/trust.md.
 */
import { randomUUID } from 'node:crypto';
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import path from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { dropDatabase, freePort, makeDatabase, readAccounts, ROOT, testSql } from '../helpers/appServer';
import { dbArg, integrityCheck } from '../helpers/db';
import { Client } from '../helpers/client';

const NEXT = path.join(ROOT, 'node_modules', 'next', 'dist', 'bin', 'next');
const children: ChildProcess[] = [];

async function serve(env: NodeJS.ProcessEnv): Promise<{ url: string; child: ChildProcess }> {
  const port = await freePort();
  const child = spawn(process.execPath, [NEXT, 'start', '-p', String(port), '-H', '127.0.0.1'], { cwd: ROOT, env: { ...env, PORT: String(port) }, stdio: 'ignore' });
  children.push(child);
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error('server exited early');
    try {
      if ((await fetch(`${url}/api/health`)).status === 200) return { url, child };
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) throw new Error('server did not become healthy');
    await new Promise((r) => setTimeout(r, 200));
  }
}

afterAll(() => {
  for (const c of children) if (c.exitCode === null) c.kill('SIGKILL');
});

describe('a server killed with SIGKILL mid-burst', () => {
  it('keeps every acknowledged bedside write, the audit chain verifies, and the database passes its integrity check', async () => {
    const d = makeDatabase({ cases: 1 });
    const first = await serve(d.env);
    const nurse = readAccounts(d.dir).find((a) => a.role === 'nurse')!;
    const c = new Client(first.url);
    await c.signIn(nurse.username, nurse.password);
    const open = await c.post('/api/v1/cases', { patient: { mrn: `K-${randomUUID().slice(0, 8)}`, familyName: 'Crash', givenName: 'Test', birthDate: '1970-01-01', sex: 'male' }, procedureType: 'colonoscopy', roomId: 'room-1', plannedDepth: 'moderate' });
    expect(open.status, open.text).toBe(201);
    const caseId = open.json.id as string;

    const acked: string[] = [];
    const sent: string[] = [];
    let errors = 0;
    const errorTexts: string[] = [];
    const WRITERS = 8;
    let killedAt = 0;
    const writer = async (w: number) => {
      for (let i = 0; ; i++) {
        const id = randomUUID();
        sent.push(id);
        const body = i % 2 === 0
          ? { type: 'vital', id, at: new Date(Date.now() - 3_600_000 + (w * 400 + i) * 1000).toISOString(), hr: 60 + (i % 40), spo2: 95 }
          : { type: 'dose', id, at: new Date(Date.now() - 3_600_000 + (w * 400 + i) * 1000).toISOString(), drugId: 'drug-propofol', amount: 10, unit: 'mg', route: 'IV' };
        try {
          const r = await c.post(`/api/v1/cases/${caseId}/entries`, body);
          if (r.status === 201 || r.status === 200) acked.push(id);
          else throw new Error(`${r.status} ${r.text}`);
        } catch (e) {
          if (killedAt) return;
          errors++;
          errorTexts.push(String(e));
          if (errors > 3) throw e;
        }
      }
    };
    const burst = Array.from({ length: WRITERS }, (_, w) => writer(w));
    // Let the burst run, then pull the plug while requests are in flight.
    const until = Date.now() + 20_000;
    while (acked.length < 40 && Date.now() < until) await new Promise((r) => setTimeout(r, 50));
    killedAt = acked.length;
    first.child.kill('SIGKILL');
    await Promise.all(burst);
    expect(errors, errorTexts.join(' | ')).toBe(0);
    expect(acked.length).toBeGreaterThan(20);

    const second = await serve(d.env);
    expect(await integrityCheck(d)).toBe('ok');
    const q = testSql(d);
    const stored = new Set([
      ...(await q.all<{ id: string }>('SELECT "id" FROM "Dose" WHERE "caseId" = ?', [caseId])).map((r) => r.id),
      ...(await q.all<{ id: string }>('SELECT "id" FROM "ManualVital" WHERE "caseId" = ?', [caseId])).map((r) => r.id),
    ]);
    const lost = acked.filter((id) => !stored.has(id));
    console.log(`crash: ${acked.length} acknowledged of ${sent.length} sent before SIGKILL; ${stored.size} stored; ${lost.length} lost`);
    expect(lost).toEqual([]);
    // Unacknowledged writes may or may not have landed; none is stored twice, and the restarted server serves the case.
    const c2 = new Client(second.url);
    await c2.signIn(nurse.username, nurse.password);
    const sheet = await c2.get(`/api/v1/cases/${caseId}/sheet`);
    expect(sheet.status).toBe(200);
    const verify = spawnSync(path.join(ROOT, 'node_modules', '.bin', 'tsx'), [path.join(ROOT, 'scripts', 'auditVerify.ts'), dbArg(d)], { cwd: ROOT, env: d.env, encoding: 'utf8' });
    expect(verify.status, verify.stderr).toBe(0);
    expect(verify.stdout).toMatch(/audit trail intact/);
    second.child.kill('SIGKILL');
    await dropDatabase(d);
  }, 180_000);
});
