/**
 * Inputs: fast-check drives every write endpoint found in app/api (POST/PATCH/PUT/DELETE) with
 * random and boundary bodies as an allowed role. Every answer is < 500, and for every refused
 * request (4xx) the database content is unchanged.
 */
import { createHash, randomUUID } from 'node:crypto';
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import fc from 'fast-check';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { ROOT, startApp, testSql, type AppServer } from '../helpers/appServer';
import { Client } from '../helpers/client';
import { ACCESS, PUBLIC_ROUTES } from '@/lib/server/policy';
import type { Role } from '@/lib/server/roles';
import type { Sql } from '@/lib/db/sql';

const APP = path.resolve(__dirname, '..', '..', 'app');
const RUNS = Number(process.env.PLATEAU_FUZZ_RUNS ?? 40);
const WRITE = ['POST', 'PUT', 'PATCH', 'DELETE'] as const;

/** Every write endpoint under app/api: `METHOD /pattern`. */
function writeEndpoints(): { method: string; pattern: string }[] {
  const out: { method: string; pattern: string }[] = [];
  const walk = (dir: string) => {
    for (const e of fs.readdirSync(dir, { withFileTypes: true })) {
      const p = path.join(dir, e.name);
      if (e.isDirectory()) walk(p);
      else if (/^route\.(ts|js)$/.test(e.name)) {
        const rel = path.relative(APP, path.dirname(p)).split(path.sep).filter((s) => s && !/^\(.*\)$/.test(s));
        const src = fs.readFileSync(p, 'utf8');
        for (const m of WRITE) if (new RegExp(`export\\s+(async\\s+)?(function|const)\\s+${m}\\b`).test(src)) out.push({ method: m, pattern: '/' + rel.join('/') });
      }
    }
  };
  walk(path.join(APP, 'api'));
  return out;
}

/** Every table of the app's schema (Prisma's migration bookkeeping excluded: no request can touch it). */
async function tableNames(q: Sql): Promise<string[]> {
  const rows =
    q.dialect === 'sqlite'
      ? await q.all<{ name: string }>(`SELECT "name" FROM sqlite_master WHERE "type" = 'table' AND "name" NOT LIKE 'sqlite_%' ORDER BY "name"`)
      : await q.all<{ name: string }>(`SELECT table_name AS "name" FROM information_schema.tables WHERE table_schema = current_schema() AND table_type = 'BASE TABLE' ORDER BY table_name`);
  return rows.map((t) => t.name).filter((t) => t !== '_prisma_migrations');
}

/** A table's primary-key columns, in key order (every Prisma model has one). */
async function primaryKey(q: Sql, table: string): Promise<string[]> {
  const rows =
    q.dialect === 'sqlite'
      ? await q.all<{ col: string }>('SELECT "name" AS "col" FROM pragma_table_info(?) WHERE "pk" > 0 ORDER BY "pk"', [table])
      : await q.all<{ col: string }>(
          `SELECT kcu.column_name AS "col" FROM information_schema.table_constraints tc
             JOIN information_schema.key_column_usage kcu ON kcu.constraint_name = tc.constraint_name AND kcu.table_schema = tc.table_schema AND kcu.table_name = tc.table_name
           WHERE tc.table_schema = current_schema() AND tc.table_name = ? AND tc.constraint_type = 'PRIMARY KEY' ORDER BY kcu.ordinal_position`,
          [table],
        );
  return rows.map((r) => r.col);
}

/** A value as text the same way on both databases (instants as ISO, bytes as hex). */
function cell(v: unknown): unknown {
  if (typeof v === 'bigint') return String(v);
  if (v instanceof Date) return v.toISOString();
  if (Buffer.isBuffer(v) || v instanceof Uint8Array) return Buffer.from(v).toString('hex');
  return v;
}

const keys = new Map<string, string[]>();
/**
 * A fingerprint of the database content: every table's rows in primary-key order, hashed
 * (sessions by count only — reads touch them). Big append-mostly tables (monitor samples): the
 * count, the highest key and the newest 500 rows.
 */
async function fingerprint(q: Sql, skip: Set<string>): Promise<Record<string, string>> {
  const out: Record<string, string> = {};
  for (const t of await tableNames(q)) {
    if (skip.has(t)) continue;
    if (t === 'Session') {
      out[t] = String((await q.get<{ n: number }>('SELECT COUNT(*) AS "n" FROM "Session"'))!.n);
      continue;
    }
    if (!keys.has(t)) keys.set(t, await primaryKey(q, t));
    const pk = keys.get(t)!;
    expect(pk.length, `${t} has a primary key`).toBeGreaterThan(0);
    const order = pk.map((c) => `"${c}"`).join(', ');
    const h = createHash('sha256');
    const n = (await q.get<{ n: number; m: unknown }>(`SELECT COUNT(*) AS "n", MAX("${pk[0]}") AS "m" FROM "${t}"`))!;
    h.update(`${n.n}:${String(cell(n.m))}`);
    const sql = n.n > 2000 ? `SELECT * FROM "${t}" ORDER BY ${pk.map((c) => `"${c}" DESC`).join(', ')} LIMIT 500` : `SELECT * FROM "${t}" ORDER BY ${order}`;
    for (const row of await q.all<Record<string, unknown>>(sql)) h.update(JSON.stringify(Object.values(row).map(cell)));
    out[t] = h.digest('hex');
  }
  return out;
}

// Field names the schemas use, so random objects reach past the first check.
const FIELDS = ['type', 'id', 'at', 'drugId', 'amount', 'unit', 'route', 'kind', 'note', 'sbp', 'dbp', 'hr', 'spo2', 'rr', 'etco2', 'sedationScore', 'target', 'targetId', 'reason', 'newAt', 'changes', 'from', 'to', 'patient', 'patientId', 'procedureType', 'roomId', 'plannedDepth', 'asaClass', 'weightKg', 'heightCm', 'username', 'password', 'displayName', 'role', 'text', 'csv', 'file', 'content', 'status', 'month', 'ruleSetId', 'version', 'rules', 'activity', 'respiration', 'circulation', 'consciousness', 'oxygenation'];
const boundary = fc.oneof(
  fc.constantFrom(0, -1, 1, -0, 0.5, 1e308, -1e308, Number.MAX_SAFE_INTEGER, 2 ** 31, '', ' ', 'a'.repeat(10_000), '\u0000', '🙂', '<script>alert(1)</script>', "' OR 1=1 --", null, true, false, [], {}, '2026-03-02T09:00:00Z', '2026-02-30T25:61:00Z', '1900-01-01', randomUUID(), 'dose', 'vital', 'void', 'retime', 'mg', 'iv', 'nurse', 'admin', 'case-demo-0001', '__proto__'),
  fc.string({ maxLength: 40 }),
  fc.integer(),
  fc.double({ noNaN: true }),
);
const objectBody = fc.dictionary(fc.constantFrom(...FIELDS), fc.oneof(boundary, fc.dictionary(fc.constantFrom(...FIELDS), boundary, { maxKeys: 4 }), fc.array(boundary, { maxLength: 4 })), { maxKeys: 8 });
type Body = { kind: 'json'; value: unknown } | { kind: 'text'; value: string; type: string };
const body: fc.Arbitrary<Body> = fc.oneof(
  { weight: 5, arbitrary: objectBody.map((value) => ({ kind: 'json' as const, value })) },
  { weight: 2, arbitrary: fc.jsonValue({ maxDepth: 3 }).map((value) => ({ kind: 'json' as const, value })) },
  { weight: 1, arbitrary: fc.oneof(fc.string({ maxLength: 60 }), fc.constantFrom('{', '{"a":', '[1,2', 'null', '"x"', '\u0000\u0001', '{"type":"dose"')).map((value) => ({ kind: 'text' as const, value, type: 'application/json' })) },
  { weight: 1, arbitrary: fc.string({ maxLength: 60 }).map((value) => ({ kind: 'text' as const, value, type: 'text/plain' })) },
);

let app: AppServer;
let db: Sql;
let openCase: string;
const clients = new Map<string, Client>();

beforeAll(async () => {
  app = await startApp({ cases: 1 });
  for (const role of ['nurse', 'lead', 'safety', 'admin']) {
    const c = new Client(app.url);
    const a = app.account(role);
    await c.signIn(a.username, a.password);
    clients.set(role, c);
  }
  const r = await clients.get('nurse')!.post('/api/v1/cases', { patient: { mrn: `F-${randomUUID().slice(0, 8)}`, familyName: 'Fuzz', givenName: 'Test', birthDate: '1970-01-01', sex: 'female' }, procedureType: 'colonoscopy', roomId: 'room-1', plannedDepth: 'moderate' });
  expect(r.status, r.text).toBe(201);
  openCase = r.json.id;
  db = testSql(app);
}, 120_000);
afterAll(async () => {
  await app?.stop();
});

describe('fuzzing every write endpoint', () => {
  const endpoints = writeEndpoints();
  const publicSet = new Set<string>(PUBLIC_ROUTES);

  it('finds the write endpoints', () => {
    expect(endpoints.length).toBeGreaterThan(10);
    expect(endpoints.map((e) => `${e.method} ${e.pattern}`)).toContain('POST /api/v1/cases/[id]/entries');
  });

  for (const ep of endpoints) {
    const key = `${ep.method} ${ep.pattern}`;
    it(`${key}: never 500, and a refused request changes nothing`, async () => {
      const roles = (ACCESS as Record<string, readonly Role[]>)[key];
      const isPublic = publicSet.has(key);
      expect(roles || isPublic, `${key} has no access entry`).toBeTruthy();
      // Sign-in failures are audited and counted on purpose; a public route runs without a session.
      const skip = new Set<string>(key === 'POST /api/v1/session' ? ['AuditEntry', 'SignInAttempt'] : []);
      const client = isPublic ? new Client(app.url) : clients.get(roles[0])!;
      const url = ep.pattern.replace(/\[id\]/g, ep.pattern.startsWith('/api/v1/reports') ? 'report-none' : openCase).replace(/\[[^\]]+\]/g, 'x');
      await fc.assert(
        fc.asyncProperty(body, async (b) => {
          const before = await fingerprint(db, skip);
          const res = b.kind === 'json' ? await client.req(ep.method, url, b.value) : await client.req(ep.method, url, b.value, { 'content-type': b.type });
          expect(res.status, `${key} ${JSON.stringify(b).slice(0, 300)} → ${res.text.slice(0, 300)}`).toBeLessThan(500);
          if (!isPublic) expect(res.status, `${key} must stay signed in`).not.toBe(401);
          if (res.status >= 400) expect(await fingerprint(db, skip), `${key} refused with ${res.status} but changed the database: ${JSON.stringify(b).slice(0, 300)}`).toEqual(before);
        }),
        { numRuns: RUNS },
      );
    }, 180_000);
  }

  it('leaves the audit chain intact', () => {
    const r = spawnSync(path.join(ROOT, 'node_modules', '.bin', 'tsx'), [path.join(ROOT, 'scripts', 'auditVerify.ts')], { cwd: ROOT, env: app.env, encoding: 'utf8' });
    expect(r.status, r.stderr).toBe(0);
  });
});
