/**
 * Starts the real, built Plateau server (`next start`) on a free port with a temporary
 * database, migrated and seeded by the real scripts. Integration and browser tests go through
 * it, so they exercise the same code a user reaches.
 *
 * The database is SQLite (a temporary file) unless PLATEAU_TEST_DIALECT=postgresql, when each
 * server gets a new database on the PostgreSQL server at PLATEAU_TEST_PG_URL (scripts/test.mjs
 * starts a throwaway one). Tests read the database through `testSql(target)`, the same Sql port
 * the app uses, so one test body checks both.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { backupDatabase } from '@/lib/db/backup';
import { PgSql } from '@/lib/db/postgres';
import { SqliteSql } from '@/lib/db/sqlite';
import type { Sql } from '@/lib/db/sql';
import type { DbTarget } from '@/lib/db/target';

export const ROOT = path.resolve(__dirname, '..', '..');
const TSX = path.join(ROOT, 'node_modules', '.bin', 'tsx');
const NEXT = path.join(ROOT, 'node_modules', 'next', 'dist', 'bin', 'next');

/** The database the integration tests run on: sqlite (default) or postgresql. */
export const TEST_DIALECT: DbTarget['dialect'] = process.env.PLATEAU_TEST_DIALECT === 'postgresql' ? 'postgresql' : 'sqlite';
export const onPostgres = TEST_DIALECT === 'postgresql';

export interface DemoAccount {
  username: string;
  password: string;
  role: string;
  displayName: string;
}

export interface TestDatabase {
  /** Folder for files that go with the database (demo-accounts.json, backups). */
  dir: string;
  /** The SQLite file ('' on PostgreSQL). */
  dbFile: string;
  target: DbTarget;
  env: NodeJS.ProcessEnv;
}

export interface AppServer extends TestDatabase {
  url: string;
  accounts: DemoAccount[];
  account(role: string): DemoAccount;
  /** The server's output so far. */
  log(): string;
  /** Stops the server and drops its database. */
  stop(): Promise<void>;
  /** Stops the server and keeps the database (a second server on it goes on). */
  stopServerOnly(): Promise<void>;
}

export async function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      srv.close(() => (a && typeof a === 'object' ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}

let dbCounter = 0;

/** Creates (or drops) a database on the test PostgreSQL server, synchronously. */
function pgAdmin(sqlText: string): void {
  const admin = process.env.PLATEAU_TEST_PG_URL;
  if (!admin) throw new Error('PLATEAU_TEST_DIALECT=postgresql needs PLATEAU_TEST_PG_URL (scripts/test.mjs starts a server for you)');
  const script = `const pg=require('pg');const c=new pg.Client({connectionString:process.env.U});c.connect().then(()=>c.query(process.env.Q)).then(()=>c.end()).catch(e=>{console.error(e.message);process.exit(1)})`;
  const r = spawnSync(process.execPath, ['-e', script], { cwd: ROOT, env: { ...process.env, U: admin, Q: sqlText }, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${sqlText} failed: ${r.stderr}`);
}

/** A new empty database's target: a temporary SQLite file, or a new PostgreSQL database. */
export function newTarget(dir: string): DbTarget {
  if (TEST_DIALECT === 'sqlite') return { dialect: 'sqlite', file: path.join(dir, 'plateau.db') };
  const name = `plateau_t_${process.pid}_${Date.now().toString(36)}_${++dbCounter}`;
  pgAdmin(`CREATE DATABASE "${name}"`);
  const u = new URL(process.env.PLATEAU_TEST_PG_URL!);
  u.pathname = `/${name}`;
  return { dialect: 'postgresql', url: u.toString() };
}

/** Environment that points the scripts and the app at a target. */
export function targetEnv(target: DbTarget, dir: string): Record<string, string> {
  return target.dialect === 'sqlite'
    ? { PLATEAU_DB_FILE: target.file, PLATEAU_DATABASE_URL: '', PLATEAU_DATA_DIR: dir }
    : { PLATEAU_DATABASE_URL: target.url, PLATEAU_DATA_DIR: dir };
}

/** Drops a test database (PostgreSQL) or removes its folder. */
export async function dropDatabase(d: TestDatabase): Promise<void> {
  await closeTestSql(d.target);
  if (d.target.dialect === 'postgresql') {
    try {
      pgAdmin(`DROP DATABASE IF EXISTS "${new URL(d.target.url).pathname.slice(1)}" WITH (FORCE)`);
    } catch {
      /* the server may be gone at the end of a run */
    }
  }
  fs.rmSync(d.dir, { recursive: true, force: true });
}

/** Makes a temporary database: migrated, and seeded with the demo unit when `cases` > 0. */
export function makeDatabase(opts: { cases?: number; password?: string } = {}): TestDatabase {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-test-'));
  const target = newTarget(dir);
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    ...targetEnv(target, dir),
    PLATEAU_DEMO_PASSWORD: opts.password ?? 'demo-pass-2026',
    PLATEAU_DEMO_CASES: String(opts.cases ?? 0),
    NEXT_TELEMETRY_DISABLED: '1',
  };
  run([TSX, path.join(ROOT, 'scripts', 'migrate.ts')], env);
  if ((opts.cases ?? 0) > 0) run([TSX, path.join(ROOT, 'scripts', 'seed.ts')], env);
  return { dir, dbFile: target.dialect === 'sqlite' ? target.file : '', target, env };
}

/**
 * A copy of a test database (content and demo sign-ins) in a new folder: SQLite through an online
 * `VACUUM INTO`; PostgreSQL as `CREATE DATABASE … TEMPLATE` (the source's test connections are
 * closed first: PostgreSQL copies only a database nobody is connected to). Drop it with dropDatabase.
 */
export async function cloneDatabase(src: TestDatabase): Promise<TestDatabase> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-test-'));
  let target: DbTarget;
  if (src.target.dialect === 'sqlite') {
    const { file } = backupDatabase(src.target, dir, new Date());
    target = { dialect: 'sqlite', file: path.join(dir, 'plateau.db') };
    fs.renameSync(file, target.file);
    fs.rmSync(`${file}.sha256`, { force: true });
  } else {
    await closeTestSql(src.target);
    const name = `plateau_t_${process.pid}_${Date.now().toString(36)}_${++dbCounter}`;
    pgAdmin(`CREATE DATABASE "${name}" TEMPLATE "${new URL(src.target.url).pathname.slice(1)}"`);
    const u = new URL(src.target.url);
    u.pathname = `/${name}`;
    target = { dialect: 'postgresql', url: u.toString() };
  }
  const accounts = path.join(src.dir, 'demo-accounts.json');
  if (fs.existsSync(accounts)) fs.copyFileSync(accounts, path.join(dir, 'demo-accounts.json'));
  return { dir, dbFile: target.dialect === 'sqlite' ? target.file : '', target, env: { ...src.env, ...targetEnv(target, dir) } };
}

export function run(cmd: string[], env: NodeJS.ProcessEnv) {
  const r = spawnSync(cmd[0], cmd.slice(1), { cwd: ROOT, env, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${cmd.join(' ')} failed (${r.status}):\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

/** The demo sign-ins the seed wrote into a test database's folder. */
export function readAccounts(dir: string): DemoAccount[] {
  const d = dir.endsWith('.db') ? path.dirname(dir) : dir;
  const f = path.join(d, 'demo-accounts.json');
  return fs.existsSync(f) ? (JSON.parse(fs.readFileSync(f, 'utf8')) as DemoAccount[]) : [];
}

const ports = new Map<string, Sql>();
const keyOf = (t: DbTarget) => (t.dialect === 'sqlite' ? t.file : t.url);

/**
 * The Sql port on a test database (kept open per database; closed by stop()/dropDatabase).
 *
 * @example
 * const n = await testSql(app.target).get<{ n: number }>('SELECT COUNT(*) AS n FROM "Dose"');
 */
export function testSql(target: DbTarget | { target: DbTarget }): Sql {
  const t = 'target' in target ? target.target : target;
  let q = ports.get(keyOf(t));
  if (!q) {
    q = t.dialect === 'sqlite' ? new SqliteSql(t.file) : new PgSql(t.url);
    ports.set(keyOf(t), q);
  }
  return q;
}

export async function closeTestSql(t: DbTarget): Promise<void> {
  const q = ports.get(keyOf(t));
  ports.delete(keyOf(t));
  await q?.close();
}

/** Starts `next start` on a database (a new seeded one unless `database` is given). Requires `next build` to have run. */
export async function startApp(opts: { cases?: number; env?: NodeJS.ProcessEnv; database?: TestDatabase } = {}): Promise<AppServer> {
  const dist = process.env.PLATEAU_NEXT_DIST || '.next';
  if (!fs.existsSync(path.join(ROOT, dist, 'BUILD_ID'))) throw new Error(`no production build in ${dist}: run \`npm run build\` (npm test does it for you)`);
  const d = opts.database ?? makeDatabase({ cases: opts.cases ?? 30 });
  const port = await freePort();
  const fullEnv = { ...d.env, ...opts.env, PORT: String(port) };
  const child: ChildProcess = spawn(process.execPath, [NEXT, 'start', '-p', String(port), '-H', '127.0.0.1'], { cwd: ROOT, env: fullEnv, stdio: ['ignore', 'pipe', 'pipe'] });
  let log = '';
  child.stdout?.on('data', (x) => (log += x));
  child.stderr?.on('data', (x) => (log += x));
  const url = `http://127.0.0.1:${port}`;
  const deadline = Date.now() + 60_000;
  for (;;) {
    if (child.exitCode !== null) throw new Error(`server exited early:\n${log}`);
    try {
      const r = await fetch(`${url}/api/health`);
      if (r.status === 200) break;
    } catch {
      /* not up yet */
    }
    if (Date.now() > deadline) {
      child.kill('SIGKILL');
      throw new Error(`server did not become healthy:\n${log}`);
    }
    await new Promise((r) => setTimeout(r, 250));
  }
  const accounts = readAccounts(d.dir);
  const stopServerOnly = async () => {
    child.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, 200));
    if (child.exitCode === null) child.kill('SIGKILL');
    await new Promise((r) => setTimeout(r, 100));
  };
  return {
    ...d,
    url,
    env: fullEnv,
    accounts,
    account(role: string) {
      const a = accounts.find((x) => x.role === role);
      if (!a) throw new Error(`no demo account with role ${role}`);
      return a;
    },
    log: () => log,
    async stop() {
      await stopServerOnly();
      await dropDatabase(d);
    },
    stopServerOnly,
  };
}
