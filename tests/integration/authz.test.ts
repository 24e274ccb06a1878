/**
 * Authorisation everywhere: every page, API route and server action found in app/ is checked
 * for every role and for no session against lib/server/policy.ts ACCESS, through the real
 * server. A route file whose key is not in ACCESS (or PUBLIC_ROUTES) fails the test.
 */
import fs from 'node:fs';
import path from 'node:path';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { ACCESS, PUBLIC_ROUTES } from '@/lib/server/policy';
import { ROLES, type Role } from '@/lib/server/roles';

const APP = path.resolve(__dirname, '..', '..', 'app');
const METHODS = ['GET', 'POST', 'PUT', 'PATCH', 'DELETE'] as const;

export interface FoundRoute {
  file: string;
  pattern: string;
  kind: 'page' | 'route';
  methods: string[];
}

/** Every page.tsx and route.ts under app/, as the URL pattern Next serves it at, with its methods. */
export function appRoutes(): FoundRoute[] {
  const out: FoundRoute[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (/^page\.(tsx|ts|jsx|js)$/.test(e.name) || /^route\.(ts|js)$/.test(e.name)) {
        const rel = path.relative(APP, path.dirname(p)).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s) && !s.startsWith('@'));
        const src = fs.readFileSync(p, 'utf8');
        const methods = METHODS.filter((m) => new RegExp(`export\\s+(async\\s+)?(function\\s+${m}\\b|const\\s+${m}\\b)|export\\s*\\{[^}]*\\b${m}\\b`).test(src));
        out.push({ file: path.relative(APP, p), pattern: '/' + rel.join('/'), kind: e.name.startsWith('page') ? 'page' : 'route', methods });
      }
    }
  };
  walk(APP);
  return out;
}

export function keysOf(r: FoundRoute): string[] {
  return r.kind === 'page' ? [r.pattern] : r.methods.map((m) => `${m} ${r.pattern}`);
}

let app: AppServer;
/** Per role, a session cookie ('' for no session). */
const cookies = new Map<Role | 'none', string>();

/** One request; reads the body only when it is not a stream (the live feed never ends). */
async function call(who: Role | 'none', method: string, url: string, body?: unknown): Promise<{ status: number; location: string; text: string }> {
  const headers: Record<string, string> = {};
  const cookie = cookies.get(who);
  if (cookie) headers.cookie = cookie;
  if (body !== undefined) headers['content-type'] = 'application/json';
  const ctl = new AbortController();
  const r = await fetch(app.url + url, { method, headers, body: body === undefined ? undefined : JSON.stringify(body), redirect: 'manual', signal: ctl.signal });
  let text = '';
  if ((r.headers.get('content-type') ?? '').includes('text/event-stream')) ctl.abort();
  else text = await r.text();
  return { status: r.status, location: r.headers.get('location') ?? '', text };
}
let ids: { caseId: string; reportId: string; ref: string };

/** Fills [id]/[ref] with ids from the seeded database (a missing report id still exercises the check). */
function concrete(pattern: string): string {
  return pattern
    .replace(/\/reports\/(issued\/)?\[id\]/, (_m, issued) => `/reports/${issued ?? ''}${ids.reportId}`)
    .replace(/\[ref\]/g, ids.ref)
    .replace(/\[id\]/g, ids.caseId)
    .replace(/\[\.\.\.[^\]]+\]/g, 'x');
}

beforeAll(async () => {
  app = await startApp({ cases: 3 });
  const q = testSql(app);
  const c = (await q.get<{ id: string }>('SELECT "id" FROM "Case" ORDER BY "id" LIMIT 1'))!;
  const rep = await q.get<{ id: string }>('SELECT "id" FROM "IssuedReport" ORDER BY "id" LIMIT 1');
  ids = { caseId: c.id, reportId: rep?.id ?? 'report-that-does-not-exist', ref: 'ref-1' };
  cookies.set('none', '');
  for (const role of ROLES) {
    const a = app.account(role);
    const r = await fetch(`${app.url}/api/v1/session`, { method: 'POST', headers: { 'content-type': 'application/json' }, body: JSON.stringify({ username: a.username, password: a.password }) });
    expect(r.status).toBe(200);
    const c = r.headers.getSetCookie().map((x) => x.split(';')[0]).find((x) => x.startsWith('plateau_session='));
    expect(c).toBeTruthy();
    cookies.set(role, c!);
  }
}, 120_000);
afterAll(async () => {
  await app?.stop();
});

const all = appRoutes();
const publicSet = new Set<string>(PUBLIC_ROUTES);

describe('the route inventory', () => {
  it('finds pages and API routes, each with a key in ACCESS or PUBLIC_ROUTES', () => {
    expect(all.filter((r) => r.kind === 'page').length).toBeGreaterThan(5);
    expect(all.filter((r) => r.kind === 'route').length).toBeGreaterThan(10);
    for (const r of all) {
      if (r.kind === 'route') expect(r.methods.length, `${r.file} exports no HTTP method this test understands`).toBeGreaterThan(0);
      for (const key of keysOf(r)) expect(key in ACCESS || publicSet.has(key), `${key} (${r.file}) has no entry in lib/server/policy.ts`).toBe(true);
    }
  });

  it('guards every server action except sign-in with requireAccess/authorizeApi', () => {
    const files: string[] = [];
    const walk = (dir: string) => {
      for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
        const p = path.join(dir, e.name);
        if (e.isDirectory()) walk(p);
        else if (/\.(ts|tsx)$/.test(e.name) && /^\s*['"]use server['"]/.test(fs.readFileSync(p, 'utf8'))) files.push(p);
      }
    };
    walk(APP);
    expect(files.length).toBeGreaterThan(0);
    for (const f of files) {
      if (f.endsWith(path.join('sign-in', 'actions.ts'))) continue;
      const src = fs.readFileSync(f, 'utf8');
      const fns = [...src.matchAll(/export async function (\w+)[^{]*\{([\s\S]*?)\n\}/g)];
      expect(fns.length, f).toBeGreaterThan(0);
      for (const [, name, body] of fns) expect(body, `${path.relative(APP, f)} ${name} must check access first`).toMatch(/requireAccess\(|authorizeApi\(/);
    }
  });
});

describe('every page, for every role and for no session', () => {
  for (const r of all.filter((x) => x.kind === 'page')) {
    const key = r.pattern;
    if (publicSet.has(key)) continue;
    it(`GET ${key}`, async () => {
      const url = concrete(r.pattern);
      const allowed = (ACCESS as Record<string, readonly Role[]>)[key];
      expect(allowed, `${key} is not in ACCESS`).toBeDefined();
      const anon = await call('none', 'GET', url);
      expect([303, 307, 308], `no session on ${url}: ${anon.status}`).toContain(anon.status);
      expect(anon.location).toMatch(/\/sign-in$/);
      for (const role of ROLES) {
        const res = await call(role, 'GET', url);
        if (allowed.includes(role)) {
          expect(res.status, `${role} on ${url}`).not.toBe(403);
          expect(res.status, `${role} on ${url}`).toBeLessThan(500);
          expect(res.location, `${role} on ${url}`).not.toMatch(/\/sign-in/);
        } else {
          expect(res.status, `${role} must be refused ${url}`).toBe(403);
        }
      }
    });
  }
});

describe('every API route and method, for every role and for no session', () => {
  for (const r of all.filter((x) => x.kind === 'route')) {
    for (const method of r.methods) {
      const key = `${method} ${r.pattern}`;
      if (publicSet.has(key)) continue;
      it(key, async () => {
        const url = concrete(r.pattern);
        const allowed = (ACCESS as Record<string, readonly Role[]>)[key];
        expect(allowed, `${key} is not in ACCESS`).toBeDefined();
        const body = method === 'GET' ? undefined : {};
        const anon = await call('none', method, url, body);
        expect(anon.status, `no session: ${key}`).toBe(401);
        for (const role of ROLES) {
          const res = await call(role, method, url, body);
          if (allowed.includes(role)) {
            expect([401, 403], `${role} on ${key} got ${res.status}: ${res.text.slice(0, 200)}`).not.toContain(res.status);
            expect(res.status, `${role} on ${key}: ${res.text.slice(0, 200)}`).toBeLessThan(500);
          } else {
            expect(res.status, `${role} must be refused ${key}`).toBe(403);
          }
        }
      });
    }
  }
});

describe('public routes', () => {
  it('lists only routes that exist', () => {
    const keys = new Set(all.flatMap(keysOf));
    for (const k of PUBLIC_ROUTES) expect(keys.has(k), `${k} is public but has no route`).toBe(true);
  });

  it('serves the sign-in page and health without a session', async () => {
    const anon = new Client(app.url);
    expect((await anon.get('/sign-in')).status).toBe(200);
    expect((await anon.get('/api/health')).status).toBe(200);
  });

  it('answers sign-in with a bad body by naming the field, and sign-out without a session', async () => {
    const anon = new Client(app.url);
    const r = await anon.post('/api/v1/session', {});
    expect(r.status).toBe(422);
    expect(r.json.error).toMatch(/username/);
    expect((await anon.req('DELETE', '/api/v1/session')).status).toBe(200);
    const so = await anon.req('POST', '/sign-out');
    expect(so.status).toBeLessThan(400);
  });
});
