/**
 * A throwaway database for a benchmark, migrated and seeded by the real scripts (as the tests
 * do; tests/helpers/appServer.ts needs vitest's __dirname, so benchmarks use this instead).
 * SQLite by default; PostgreSQL when PLATEAU_BENCH_DIALECT=postgresql (or, as the tests,
 * PLATEAU_TEST_DIALECT=postgresql): a new database on the server at PLATEAU_BENCH_PG_URL /
 * PLATEAU_TEST_PG_URL (a role that may create databases), else on a throwaway local cluster
 * (scripts/pgServer.mjs); dropped at the end.
 */
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { scratchDatabase } from '../../scripts/pgServer.mjs';
import type { DbTarget } from '../../lib/db/target';

export const ROOT = path.resolve(path.dirname(fileURLToPath(import.meta.url)), '..', '..');
export const BENCH_DIALECT: DbTarget['dialect'] = (process.env.PLATEAU_BENCH_DIALECT ?? process.env.PLATEAU_TEST_DIALECT) === 'postgresql' ? 'postgresql' : 'sqlite';
const PG_SERVER_URL = process.env.PLATEAU_BENCH_PG_URL ?? process.env.PLATEAU_TEST_PG_URL;

export interface BenchDatabase {
  dir: string;
  target: DbTarget;
  env: NodeJS.ProcessEnv;
  /** Drops the database and removes its folder. */
  drop(): Promise<void>;
}

export async function makeBenchDatabase(label: string, cases: number): Promise<BenchDatabase> {
  const dir = fs.mkdtempSync(path.join(os.tmpdir(), `plateau-bench-${label}-`));
  let target: DbTarget;
  let dbEnv: Record<string, string>;
  let dropDb: () => Promise<void> = () => Promise.resolve();
  if (BENCH_DIALECT === 'postgresql') {
    const s = await scratchDatabase(`plateau_bench_${label}`, PG_SERVER_URL);
    target = { dialect: 'postgresql', url: s.url };
    dbEnv = { PLATEAU_DATABASE_URL: target.url, PLATEAU_DATA_DIR: dir };
    dropDb = s.done;
  } else {
    target = { dialect: 'sqlite', file: path.join(dir, 'plateau.db') };
    dbEnv = { PLATEAU_DB_FILE: target.file, PLATEAU_DATABASE_URL: '', PLATEAU_DATA_DIR: dir };
  }
  const env = { ...process.env, ...dbEnv, PLATEAU_DEMO_CASES: String(cases), PLATEAU_DEMO_PASSWORD: 'bench-pass-2026', NEXT_TELEMETRY_DISABLED: '1' };
  for (const script of ['migrate.ts', 'seed.ts']) {
    const r = spawnSync(process.execPath, ['--import', 'tsx', path.join(ROOT, 'scripts', script)], { cwd: ROOT, env, encoding: 'utf8' });
    if (r.status !== 0) throw new Error(`${script} failed:\n${r.stdout}\n${r.stderr}`);
  }
  return {
    dir,
    target,
    env,
    drop: async () => {
      await dropDb();
      fs.rmSync(dir, { recursive: true, force: true });
    },
  };
}

/** The demo sign-ins the seed wrote into the database's folder. */
export function benchAccounts(d: BenchDatabase): { username: string; password: string; role: string }[] {
  return JSON.parse(fs.readFileSync(path.join(d.dir, 'demo-accounts.json'), 'utf8'));
}

export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      srv.close(() => (a && typeof a === 'object' ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}
