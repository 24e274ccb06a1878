/**
 * Web surface and concurrency: sign-in rate limiting and lockout, security headers with a
 * per-request CSP nonce, the audit search for leads and admins, and two users writing the
 * same case at once.
 */
import { randomUUID } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROOT, startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { asDate, type SqlValue } from '@/lib/db/sql';

let app: AppServer;
beforeAll(async () => {
  app = await startApp({ cases: 1, env: { PLATEAU_SIGNIN_MAX_FAILURES: '3', PLATEAU_SIGNIN_WINDOW_MIN: '15', PLATEAU_SIGNIN_LOCKOUT_MIN: '15', PLATEAU_SIGNIN_ORIGIN_MAX_FAILURES: '6', NODE_ENV: 'production' } });
}, 120_000);
afterAll(async () => {
  await app?.stop();
});

const q = <T,>(sql: string, ...args: SqlValue[]): Promise<T[]> => testSql(app).all<T>(sql, args);

async function signedIn(role: string, which = 0) {
  const a = app.accounts.filter((x) => x.role === role)[which];
  const c = new Client(app.url);
  await c.signIn(a.username, a.password);
  return { c, a };
}

async function newCase(c: Client) {
  const r = await c.post('/api/v1/cases', { patient: { mrn: `S-${randomUUID().slice(0, 8)}`, familyName: 'Secure', givenName: 'Test', birthDate: '1965-01-01', sex: 'female' }, procedureType: 'colonoscopy', roomId: 'room-1', plannedDepth: 'moderate', weightKg: 80 });
  expect(r.status, r.text).toBe(201);
  return r.json.id as string;
}

describe('sign-in rate limiting and lockout', () => {
  it('locks a username after 3 failures, says when to retry, refuses even the right password, and audits it', async () => {
    const a = app.accounts.filter((x) => x.role === 'nurse')[1];
    const c = new Client(app.url);
    for (let i = 0; i < 3; i++) {
      const r = await c.post('/api/v1/session', { username: a.username, password: 'wrong-password-1' });
      expect(r.status).toBe(401);
      expect(r.json.error).toBe('Username or password is not right.');
    }
    const locked = await c.post('/api/v1/session', { username: a.username, password: a.password });
    expect(locked.status).toBe(429);
    expect(Number(locked.headers.get('retry-after'))).toBeGreaterThan(800);
    expect(locked.json.error).toMatch(/Too many failed sign-ins for this account\. Sign-in is locked; try again in 15 minutes \(at \d\d:\d\d UTC\)\./);
    expect((await q<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEntry" WHERE "action" = 'sign_in_locked' AND "after" LIKE ?`, `%${a.username}%`))[0].n).toBe(1);
    // Another account is not affected.
    await signedIn('nurse', 0);
    // After the lockout the right password works again (the failures are moved 16 minutes into the past).
    const failures = await q<{ id: number; at: unknown }>('SELECT "id", "at" FROM "SignInAttempt" WHERE "username" = ?', a.username.toLowerCase());
    expect(failures.length).toBeGreaterThanOrEqual(3);
    await testSql(app).tx(async (t) => {
      for (const f of failures) await t.run('UPDATE "SignInAttempt" SET "at" = ? WHERE "id" = ?', [new Date(asDate(f.at).getTime() - 16 * 60_000), f.id]);
    });
    expect((await c.post('/api/v1/session', { username: a.username, password: a.password })).status).toBe(200);
  });

  it('treats an unknown username like a real one, so the lockout reveals no account', async () => {
    const c = new Client(app.url);
    for (let i = 0; i < 3; i++) await c.post('/api/v1/session', { username: 'nobody-here', password: 'x-wrong-password' });
    const r = await c.post('/api/v1/session', { username: 'nobody-here', password: 'x-wrong-password' });
    expect(r.json.error).toMatch(/Too many failed sign-ins for this account/);
  });

  it('limits failures per client address across usernames', async () => {
    const c = new Client(app.url);
    const h = { 'x-forwarded-for': '10.9.8.7' };
    for (let i = 0; i < 6; i++) expect((await c.post('/api/v1/session', { username: `guess-${i}`, password: 'nope-nope-nope' }, h)).json.error).toBe('Username or password is not right.');
    const r = await c.post('/api/v1/session', { username: 'guess-new', password: 'nope-nope-nope' }, h);
    expect(r.json.error).toMatch(/Too many failed sign-ins for this address/);
    // Another address still gets through.
    const a = app.account('lead');
    expect((await new Client(app.url).post('/api/v1/session', { username: a.username, password: a.password }, { 'x-forwarded-for': '10.9.8.8' })).status).toBe(200);
  });
});

describe('security headers', () => {
  it('gives each page a fresh CSP nonce that every script carries, and no inline script without it', async () => {
    const r1 = await fetch(`${app.url}/sign-in`);
    const r2 = await fetch(`${app.url}/sign-in`);
    const csp = r1.headers.get('content-security-policy') ?? '';
    const nonce = /'nonce-([^']+)'/.exec(csp)?.[1];
    expect(nonce).toBeTruthy();
    expect(r2.headers.get('content-security-policy')).not.toContain(nonce!);
    expect(csp).toContain("frame-ancestors 'none'");
    expect(csp).toContain("object-src 'none'");
    expect(csp).not.toMatch(/script-src[^;]*'unsafe-inline'/);
    expect(csp).not.toMatch(/'unsafe-eval'/);
    const html = await r1.text();
    const scripts = [...html.matchAll(/<script\b[^>]*>/g)].map((m) => m[0]);
    expect(scripts.length).toBeGreaterThan(0);
    for (const s of scripts) expect(s, s).toContain(`nonce="${nonce}"`);
    expect(r1.headers.get('x-content-type-options')).toBe('nosniff');
    expect(r1.headers.get('referrer-policy')).toBe('same-origin');
    expect(r1.headers.get('x-frame-options')).toBe('DENY');
    expect(r1.headers.get('strict-transport-security')).toBeNull();
  });

  it('locks API answers down completely', async () => {
    const r = await fetch(`${app.url}/api/health`);
    expect(r.headers.get('content-security-policy')).toContain("default-src 'none'");
    expect(r.headers.get('x-content-type-options')).toBe('nosniff');
  });

  it('adds HSTS behind HTTPS (PLATEAU_SECURE_COOKIES=1)', async () => {
    const secure = await startApp({ cases: 0, env: { PLATEAU_SECURE_COOKIES: '1', NODE_ENV: 'production' } });
    try {
      for (const p of ['/sign-in', '/api/health']) expect((await fetch(secure.url + p)).headers.get('strict-transport-security')).toMatch(/max-age=31536000/);
    } finally {
      await secure.stop();
    }
  }, 90_000);
});

describe('audit search', () => {
  it('finds entries by case, by user and by period for a lead and an admin, and refuses a nurse', async () => {
    const { c: nurse, a } = await signedIn('nurse', 0);
    const caseId = await newCase(nurse);
    await nurse.post(`/api/v1/cases/${caseId}/entries`, { type: 'vital', id: randomUUID(), at: new Date().toISOString(), hr: 70 });
    for (const role of ['lead', 'admin']) {
      const { c } = await signedIn(role);
      const byCase = await c.get(`/api/v1/audit?caseId=${caseId}`);
      expect(byCase.status).toBe(200);
      expect(byCase.json.rows.length).toBeGreaterThanOrEqual(2);
      for (const r of byCase.json.rows) expect(r.caseId).toBe(caseId);
      const byUser = await c.get(`/api/v1/audit?user=${a.username}&limit=500`);
      expect(byUser.json.rows.length).toBeGreaterThan(0);
      for (const r of byUser.json.rows) expect(r.actor).toBe(a.username);
      const today = new Date().toISOString().slice(0, 10);
      expect((await c.get(`/api/v1/audit?from=${today}&to=${today}&caseId=${caseId}`)).json.rows.length).toBe(byCase.json.rows.length);
      expect((await c.get(`/api/v1/audit?from=2001-01-01&to=2001-01-02`)).json.rows).toEqual([]);
      const bad = await c.get('/api/v1/audit?from=yesterday');
      expect(bad.status).toBe(422);
      expect(bad.json.error).toMatch(/^from: /);
      const page = await c.get(`/audit?caseId=${caseId}`);
      expect(page.status).toBe(200);
      expect(page.text).toContain('data-testid="audit-rows"');
    }
    expect((await nurse.get('/api/v1/audit')).status).toBe(403);
    expect((await nurse.get('/audit')).status).toBe(403);
  });
});

describe('two users writing the same case at once', () => {
  it('loses no entry from parallel writers', async () => {
    const { c: n1 } = await signedIn('nurse', 0);
    const { c: lead } = await signedIn('lead', 0);
    const caseId = await newCase(n1);
    const ids: string[] = [];
    const write = (c: Client, i: number) => {
      const id = randomUUID();
      ids.push(id);
      const at = new Date(Date.now() - 3_600_000 + i * 1000).toISOString();
      return c.post(`/api/v1/cases/${caseId}/entries`, i % 2 ? { type: 'vital', id, at, hr: 60 + (i % 30) } : { type: 'dose', id, at, drugId: 'drug-propofol', amount: 10, unit: 'mg', route: 'IV' });
    };
    const results = await Promise.all(Array.from({ length: 60 }, (_, i) => write(i % 2 ? n1 : lead, i)));
    for (const r of results) expect(r.status, r.text).toBe(201);
    const stored = (await q<{ id: string }>('SELECT "id" FROM "Dose" WHERE "caseId" = ? UNION SELECT "id" FROM "ManualVital" WHERE "caseId" = ?', caseId, caseId)).map((r) => r.id);
    expect(new Set(stored)).toEqual(new Set(ids));
    const sheet = await n1.get(`/api/v1/cases/${caseId}/sheet`);
    expect(sheet.status).toBe(200);
  });

  it('accepts exactly one of several simultaneous edits of the same fact and refuses the rest by name', async () => {
    const { c: n1 } = await signedIn('nurse', 0);
    const { c: lead } = await signedIn('lead', 0);
    const caseId = await newCase(n1);
    const targets = [81, 82, 83, 84, 85, 86];
    const rs = await Promise.all(targets.map((to, i) => (i % 2 ? n1 : lead).req('PATCH', `/api/v1/cases/${caseId}`, { changes: { weightKg: { from: 80, to } } })));
    const ok = rs.filter((r) => r.status === 200);
    const conflicts = rs.filter((r) => r.status === 409);
    expect(ok.length).toBe(1);
    expect(conflicts.length).toBe(targets.length - 1);
    for (const r of conflicts) expect(r.json.error).toMatch(/changes\.weightKg: changed by someone else/);
    const winner = targets[rs.findIndex((r) => r.status === 200)];
    expect((await q<{ weightKg: number }>('SELECT "weightKg" FROM "Case" WHERE "id" = ?', caseId))[0].weightKg).toBe(winner);
    // Edits of different facts at the same moment both land.
    const [a, b] = await Promise.all([n1.req('PATCH', `/api/v1/cases/${caseId}`, { changes: { allergies: { from: null, to: 'latex' } } }), lead.req('PATCH', `/api/v1/cases/${caseId}`, { changes: { heightCm: { from: null, to: 170 } } })]);
    expect([a.status, b.status]).toEqual([200, 200]);
    expect((await q('SELECT "allergies", "heightCm" FROM "Case" WHERE "id" = ?', caseId))[0]).toEqual({ allergies: 'latex', heightCm: 170 });
  });

  it('leaves the audit chain intact', () => {
    const r = spawnSync(path.join(ROOT, 'node_modules', '.bin', 'tsx'), [path.join(ROOT, 'scripts', 'auditVerify.ts')], { cwd: ROOT, env: app.env, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
  });
});
