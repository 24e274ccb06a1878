import { randomUUID } from 'node:crypto';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';

let app: AppServer;

beforeAll(async () => {
  app = await startApp({ cases: 30 });
});
afterAll(async () => {
  await app?.stop();
});

const count = async (table: string) => (await testSql(app).get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "${table}"`))!.n;

describe('health', () => {
  it('reports the database reachable and migrations current', async () => {
    const r = await new Client(app.url).get('/api/health');
    expect(r.status).toBe(200);
    expect(r.json).toMatchObject({ status: 'ok', database: 'reachable', migrations: 'current', pending: [] });
  });
});

describe('sign-in', () => {
  it('lets a demo nurse in and shows who is signed in', async () => {
    const nurse = app.account('nurse');
    const c = new Client(app.url);
    await c.signIn(nurse.username, nurse.password);
    const me = await c.get('/api/v1/me');
    expect(me.status).toBe(200);
    expect(me.json).toMatchObject({ username: nurse.username, role: 'nurse' });
  });

  it('sets the session cookie httpOnly and SameSite, and keeps only its hash on the server', async () => {
    const nurse = app.account('nurse');
    const r = await fetch(`${app.url}/api/v1/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: nurse.username, password: nurse.password }) });
    const cookie = r.headers.getSetCookie().find((c) => c.startsWith('plateau_session='))!;
    expect(cookie).toMatch(/HttpOnly/i);
    expect(cookie).toMatch(/SameSite=lax/i);
    const token = cookie.split(';')[0].split('=')[1];
    expect(await testSql(app).get('SELECT COUNT(*) AS "n" FROM "Session" WHERE "id" = ?', [token])).toEqual({ n: 0 });
  });

  it('refuses a wrong password with one message, audits the failure and opens no session', async () => {
    const sessions = await count('Session');
    const r = await new Client(app.url).post('/api/v1/session', { username: app.account('nurse').username, password: 'wrong-password-1' });
    expect(r.status).toBe(401);
    expect(r.json.error).toBe('Username or password is not right.');
    const unknown = await new Client(app.url).post('/api/v1/session', { username: 'nobody.here', password: 'whatever-123' });
    expect(unknown.json.error).toBe(r.json.error);
    expect(await count('Session')).toBe(sessions);
    const failures = (await testSql(app).get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "AuditEntry" WHERE "action" = 'sign_in_failed'`))!;
    expect(failures.n).toBeGreaterThanOrEqual(2);
  });

  it('answers malformed sign-in bodies with a message naming the field, and writes nothing', async () => {
    const before = { sessions: await count('Session'), audit: await count('AuditEntry') };
    const c = new Client(app.url);
    const empty = await c.post('/api/v1/session', { username: '', password: '' });
    expect(empty.status).toBe(422);
    expect(empty.json.error).toMatch(/username: is required/);
    const notJson = await c.post('/api/v1/session', '{not json', { 'content-type': 'application/json' });
    expect(notJson.status).toBe(400);
    expect(notJson.json.error).toMatch(/body: not valid JSON/);
    const wrongType = await c.post('/api/v1/session', { username: 42 });
    expect(wrongType.status).toBe(422);
    expect(wrongType.json.error).toMatch(/username/);
    expect({ sessions: await count('Session'), audit: await count('AuditEntry') }).toEqual(before);
  });

  it('signs out: the session stops working', async () => {
    const c = new Client(app.url);
    await c.signIn(app.account('lead').username, app.account('lead').password);
    expect((await c.get('/api/v1/me')).status).toBe(200);
    await c.req('DELETE', '/api/v1/session');
    expect((await c.get('/api/v1/me')).status).toBe(401);
  });
});

describe('role checks: for each role one allowed and one forbidden page and API call', () => {
  const table = [
    { role: 'nurse', allowedPage: '/cases', forbiddenPage: '/admin', allowedApi: '/api/v1/cases', forbiddenApi: '/api/v1/admin/users' },
    { role: 'lead', allowedPage: '/reports', forbiddenPage: '/admin', allowedApi: '/api/v1/cases', forbiddenApi: '/api/v1/admin/users' },
    { role: 'safety', allowedPage: '/reports', forbiddenPage: '/cases', allowedApi: '/api/v1/me', forbiddenApi: '/api/v1/cases' },
    { role: 'admin', allowedPage: '/admin', forbiddenPage: null, allowedApi: '/api/v1/admin/users', forbiddenApi: '/api/v1/cases/x/doses' },
  ] as const;

  for (const row of table) {
    it(`${row.role}: may open ${row.allowedPage} and ${row.allowedApi}; is refused ${row.forbiddenPage ?? '(admin may open every page)'} and ${row.forbiddenApi}`, async () => {
      const a = app.account(row.role);
      const c = new Client(app.url);
      await c.signIn(a.username, a.password);
      expect((await c.get(row.allowedPage)).status).toBe(200);
      if (row.forbiddenPage) expect((await c.get(row.forbiddenPage)).status).toBe(403);
      expect((await c.get(row.allowedApi)).status).toBe(200);
      const forbidden = row.forbiddenApi.endsWith('/doses') ? await c.post(row.forbiddenApi, {}) : await c.get(row.forbiddenApi);
      expect(forbidden.status).toBe(403);
    });
  }

  it('no session: pages send to sign-in, API calls get 401', async () => {
    const c = new Client(app.url);
    const page = await c.get('/cases');
    expect([303, 307, 308]).toContain(page.status);
    expect(page.headers.get('location')).toMatch(/\/sign-in/);
    expect((await c.get('/api/v1/cases')).status).toBe(401);
  });

  it('a safety officer cannot write case data', async () => {
    const c = new Client(app.url);
    await c.signIn(app.account('safety').username, app.account('safety').password);
    const before = await count('Dose');
    const r = await c.post('/api/v1/cases/case-demo-0001/doses', { id: randomUUID(), drugId: 'drug-propofol', amount: 30, unit: 'mg', route: 'IV', at: new Date().toISOString() });
    expect(r.status).toBe(403);
    expect(await count('Dose')).toBe(before);
  });
});

describe('writing a dose', () => {
  async function nurseAndCase() {
    const c = new Client(app.url);
    await c.signIn(app.account('nurse').username, app.account('nurse').password);
    const list = await c.get('/api/v1/cases');
    const open = list.json.cases.find((x: { status: string }) => x.status !== 'signed');
    expect(open, 'the demo has an unsigned case today').toBeTruthy();
    return { c, caseId: open.id as string };
  }

  it('stores a dose once even when the device sends it twice', async () => {
    const { c, caseId } = await nurseAndCase();
    const dose = { id: randomUUID(), drugId: 'drug-propofol', amount: 40, unit: 'mg', route: 'IV', at: new Date().toISOString() };
    const first = await c.post(`/api/v1/cases/${caseId}/doses`, dose);
    expect(first.status).toBe(201);
    const again = await c.post(`/api/v1/cases/${caseId}/doses`, dose);
    expect(again.status).toBe(200);
    expect(await testSql(app).get('SELECT COUNT(*) AS "n" FROM "Dose" WHERE "id" = ?', [dose.id])).toEqual({ n: 1 });
    const changed = await c.post(`/api/v1/cases/${caseId}/doses`, { ...dose, amount: 400 });
    expect(changed.status).toBe(409);
  });

  it('refuses bad doses with a message naming the field, and writes nothing', async () => {
    const { c, caseId } = await nurseAndCase();
    const good = { id: randomUUID(), drugId: 'drug-propofol', amount: 40, unit: 'mg', route: 'IV', at: new Date().toISOString() };
    const before = { doses: await count('Dose'), audit: await count('AuditEntry') };
    const cases: [Record<string, unknown>, RegExp, number][] = [
      [{ ...good, amount: -5 }, /amount: must be more than 0/, 422],
      [{ ...good, amount: 'ten' }, /amount: must be a number/, 422],
      [{ ...good, unit: 'bucket' }, /unit: must be one of/, 422],
      [{ ...good, id: 'not-a-uuid' }, /id: must be a UUID/, 422],
      [{ ...good, at: 'yesterday' }, /at: must be an ISO 8601 instant/, 422],
      [{ ...good, drugId: 'drug-unknown' }, /drugId: .* is not in this unit's formulary/, 404],
    ];
    for (const [body, message, status] of cases) {
      const r = await c.post(`/api/v1/cases/${caseId}/doses`, body);
      expect(r.status, JSON.stringify(body)).toBe(status);
      expect(r.json.error).toMatch(message);
    }
    const unknownCase = await c.post('/api/v1/cases/no-such-case/doses', good);
    expect(unknownCase.status).toBe(404);
    expect({ doses: await count('Dose'), audit: await count('AuditEntry') }).toEqual(before);
  });

  it('refuses a mutation sent from another site (Origin check)', async () => {
    const { c, caseId } = await nurseAndCase();
    const r = await c.post(`/api/v1/cases/${caseId}/doses`, { id: randomUUID(), drugId: 'drug-propofol', amount: 40, unit: 'mg', route: 'IV', at: new Date().toISOString() }, { origin: 'https://evil.example' });
    expect(r.status).toBe(403);
  });
});

describe('administration', () => {
  it('an admin creates an account; bad input is refused with the field named and nothing written', async () => {
    const c = new Client(app.url);
    await c.signIn(app.account('admin').username, app.account('admin').password);
    const users = await count('User');
    const weak = await c.post('/api/v1/admin/users', { username: 'new.nurse', displayName: 'New Nurse', role: 'nurse', password: 'short' });
    expect(weak.status).toBe(422);
    expect(weak.json.error).toMatch(/password: must be at least 10 characters/);
    const badRole = await c.post('/api/v1/admin/users', { username: 'new.nurse', displayName: 'New Nurse', role: 'boss', password: 'long-enough-123' });
    expect(badRole.json.error).toMatch(/role: must be one of/);
    const badName = await c.post('/api/v1/admin/users', { username: 'New Nurse!', displayName: 'New Nurse', role: 'nurse', password: 'long-enough-123' });
    expect(badName.json.error).toMatch(/username: may use only/);
    expect(await count('User')).toBe(users);
    const ok = await c.post('/api/v1/admin/users', { username: 'new.nurse', displayName: 'New Nurse', role: 'nurse', password: 'long-enough-123' });
    expect(ok.status).toBe(201);
    const dup = await c.post('/api/v1/admin/users', { username: 'new.nurse', displayName: 'Again', role: 'nurse', password: 'long-enough-123' });
    expect(dup.status).toBe(409);
    expect(await count('User')).toBe(users + 1);
    const fresh = new Client(app.url);
    await fresh.signIn('new.nurse', 'long-enough-123');
    expect((await fresh.get('/api/v1/me')).json.role).toBe('nurse');
  });
});
