/**
 * Starts the real, built Plateau server (`next start`) on a free port with a temporary
 * database, migrated and seeded by the real scripts. Integration and browser tests go through
 * it, so they exercise the same code a user reaches.
 */
import { spawn, spawnSync, type ChildProcess } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';

export const ROOT = path.resolve(__dirname, '..', '..');
const TSX = path.join(ROOT, 'node_modules', '.bin', 'tsx');
const NEXT = path.join(ROOT, 'node_modules', 'next', 'dist', 'bin', 'next');

export interface DemoAccount {
  username: string;
  password: string;
  role: string;
  displayName: string;
}

export interface AppServer {
  url: string;
  dir: string;
  dbFile: string;
  env: NodeJS.ProcessEnv;
  accounts: DemoAccount[];
  account(role: string): DemoAccount;
  stop(): Promise<void>;
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

/** Makes a temporary database: migrated, and seeded with the demo unit when `cases` > 0. */
export function makeDatabase(opts: { cases?: number; password?: string } = {}): { dir: string; dbFile: string; env: NodeJS.ProcessEnv } {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-test-'));
  const dbFile = path.join(dir, 'plateau.db');
  const env: NodeJS.ProcessEnv = {
    ...process.env,
    PLATEAU_DB_FILE: dbFile,
    PLATEAU_DEMO_PASSWORD: opts.password ?? 'demo-pass-2026',
    PLATEAU_DEMO_CASES: String(opts.cases ?? 0),
    NEXT_TELEMETRY_DISABLED: '1',
  };
  run([TSX, path.join(ROOT, 'scripts', 'migrate.ts')], env);
  if ((opts.cases ?? 0) > 0) run([TSX, path.join(ROOT, 'scripts', 'seed.ts')], env);
  return { dir, dbFile, env };
}

function run(cmd: string[], env: NodeJS.ProcessEnv) {
  const r = spawnSync(cmd[0], cmd.slice(1), { cwd: ROOT, env, encoding: 'utf8' });
  if (r.status !== 0) throw new Error(`${cmd.join(' ')} failed (${r.status}):\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

export function readAccounts(dbFile: string): DemoAccount[] {
  const f = path.join(path.dirname(dbFile), 'demo-accounts.json');
  return fs.existsSync(f) ? (JSON.parse(fs.readFileSync(f, 'utf8')) as DemoAccount[]) : [];
}

/** Starts `next start` against a fresh seeded database. Requires `next build` to have run. */
export async function startApp(opts: { cases?: number; env?: NodeJS.ProcessEnv } = {}): Promise<AppServer> {
  const dist = process.env.PLATEAU_NEXT_DIST || '.next';
  if (!fs.existsSync(path.join(ROOT, dist, 'BUILD_ID'))) throw new Error(`no production build in ${dist}: run \`npm run build\` (npm test does it for you)`);
  const { dir, dbFile, env } = makeDatabase({ cases: opts.cases ?? 30 });
  const port = await freePort();
  const fullEnv = { ...env, ...opts.env, PORT: String(port) };
  const child: ChildProcess = spawn(process.execPath, [NEXT, 'start', '-p', String(port), '-H', '127.0.0.1'], { cwd: ROOT, env: fullEnv, stdio: ['ignore', 'pipe', 'pipe'] });
  let log = '';
  child.stdout?.on('data', (d) => (log += d));
  child.stderr?.on('data', (d) => (log += d));
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
  const accounts = readAccounts(dbFile);
  return {
    url,
    dir,
    dbFile,
    env: fullEnv,
    accounts,
    account(role: string) {
      const a = accounts.find((x) => x.role === role);
      if (!a) throw new Error(`no demo account with role ${role}`);
      return a;
    },
    async stop() {
      child.kill('SIGTERM');
      await new Promise((r) => setTimeout(r, 200));
      if (child.exitCode === null) child.kill('SIGKILL');
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}
