// A throwaway PostgreSQL server for tests, benchmarks and `db:diff`: a new cluster in a
// temporary folder, listening on loopback only, from Debian's postgresql packages
// (/usr/lib/postgresql/<version>/bin). Nothing is downloaded.
//
//   node scripts/pgServer.mjs start [dir]   prints PLATEAU_TEST_PG_URL=… (the server keeps running)
//   node scripts/pgServer.mjs stop <dir>
//
// As root, the cluster runs as the `postgres` user (PostgreSQL refuses to run as root).
import { execFileSync, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import os from 'node:os';
import path from 'node:path';
import pg from 'pg';

/** The folder of PostgreSQL's server programs, newest version first, or null. */
export function postgresBinDir() {
  if (process.env.PLATEAU_PG_BIN) return process.env.PLATEAU_PG_BIN;
  const base = '/usr/lib/postgresql';
  if (!fs.existsSync(base)) return null;
  const versions = fs.readdirSync(base).filter((v) => /^\d+$/.test(v) && fs.existsSync(path.join(base, v, 'bin', 'initdb'))).sort((a, b) => Number(b) - Number(a));
  return versions.length ? path.join(base, versions[0], 'bin') : null;
}

function freePort() {
  return new Promise((resolve, reject) => {
    const srv = net.createServer();
    srv.listen(0, '127.0.0.1', () => {
      const a = srv.address();
      srv.close(() => (a && typeof a === 'object' ? resolve(a.port) : reject(new Error('no port'))));
    });
  });
}

const asRoot = () => typeof process.getuid === 'function' && process.getuid() === 0;

function runAsOwner(bin, args, opts = {}) {
  const cmd = asRoot() ? ['runuser', ['-u', 'postgres', '--', bin, ...args]] : [bin, args];
  const r = spawnSync(cmd[0], cmd[1], { encoding: 'utf8', ...opts });
  if (r.status !== 0) throw new Error(`${bin} ${args.join(' ')} failed (${r.status}):\n${r.stdout}\n${r.stderr}`);
  return r.stdout;
}

/**
 * Starts a new cluster in `dir` (made when not given). Returns its URL (user plateau, trust
 * authentication on loopback, database `postgres`) and a stop function.
 */
export async function startTempPostgres(opts = {}) {
  const bin = postgresBinDir();
  if (!bin) throw new Error('PostgreSQL server programs not found (Debian: apt-get install -y postgresql)');
  const dir = opts.dir ?? fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-pg-'));
  fs.mkdirSync(dir, { recursive: true });
  const data = path.join(dir, 'data');
  if (asRoot()) execFileSync('chown', ['-R', 'postgres', dir]);
  fs.chmodSync(dir, 0o755);
  runAsOwner(path.join(bin, 'initdb'), ['-D', data, '-U', 'plateau', '--auth=trust', '--encoding=UTF8', '--locale=C.UTF-8', '--no-sync']);
  const port = opts.port ?? (await freePort());
  const settings = ['-c', 'listen_addresses=127.0.0.1', '-c', `port=${port}`, '-c', `unix_socket_directories=${dir}`, '-c', 'max_connections=300', '-c', 'shared_buffers=256MB', '-c', 'work_mem=32MB'];
  runAsOwner(path.join(bin, 'pg_ctl'), ['-D', data, '-l', path.join(dir, 'server.log'), '-w', '-t', '60', '-o', settings.map((s) => (s.includes(' ') ? `"${s}"` : s)).join(' '), 'start']);
  const url = `postgresql://plateau@127.0.0.1:${port}/postgres`;
  fs.writeFileSync(path.join(dir, 'url'), url);
  return { url, dir, stop: () => stopTempPostgres(dir) };
}

export function stopTempPostgres(dir) {
  const bin = postgresBinDir();
  if (!bin || !fs.existsSync(path.join(dir, 'data'))) return;
  try {
    runAsOwner(path.join(bin, 'pg_ctl'), ['-D', path.join(dir, 'data'), '-m', 'fast', '-w', 'stop']);
  } catch {
    /* already stopped */
  }
  fs.rmSync(dir, { recursive: true, force: true });
}

async function admin(url, text) {
  const c = new pg.Client({ connectionString: url });
  await c.connect();
  try {
    await c.query(text);
  } finally {
    await c.end();
  }
}

/**
 * A new empty database named `<prefix>_<time>` on the server at `adminUrl` (a role that may create
 * databases), or, without one, on a throwaway cluster started here. `done()` drops it (and stops
 * the cluster when this started one).
 */
export async function scratchDatabase(prefix, adminUrl) {
  let server = null;
  if (!adminUrl) {
    server = await startTempPostgres();
    adminUrl = server.url;
  }
  const name = `${prefix}_${process.pid}_${Date.now().toString(36)}`;
  await admin(adminUrl, `CREATE DATABASE "${name}"`);
  const u = new URL(adminUrl);
  u.pathname = `/${name}`;
  return {
    url: u.toString(),
    async done() {
      await admin(adminUrl, `DROP DATABASE IF EXISTS "${name}" WITH (FORCE)`).catch(() => undefined);
      server?.stop();
    },
  };
}

if (import.meta.url === `file://${process.argv[1]}`) {
  const [cmd, dir] = process.argv.slice(2);
  if (cmd === 'start') {
    startTempPostgres({ dir }).then((s) => console.log(`PLATEAU_TEST_PG_URL=${s.url}\nPLATEAU_TEST_PG_DIR=${s.dir}`), (e) => {
      console.error(e.message);
      process.exit(1);
    });
  } else if (cmd === 'stop' && dir) {
    stopTempPostgres(dir);
  } else {
    console.error('usage: node scripts/pgServer.mjs start [dir] | stop <dir>');
    process.exit(2);
  }
}
