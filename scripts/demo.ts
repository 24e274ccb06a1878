// One command for the demo: migrate, seed the fictional unit if the database is empty,
// build when the sources changed since the last build, then serve on localhost and print the
// URL and the demo sign-ins. PORT (default 3000) and the database settings (PLATEAU_DATABASE_URL,
// PLATEAU_DB_FILE) are honoured.
import { spawn, spawnSync } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { dataDir } from '../lib/db/target';

const root = process.cwd();
const tsx = path.join(root, 'node_modules', '.bin', 'tsx');
const next = path.join(root, 'node_modules', 'next', 'dist', 'bin', 'next');
const port = process.env.PORT ?? '3000';
const host = process.env.HOST ?? '127.0.0.1';

function step(label: string, cmd: string, args: string[]) {
  console.log(`\n── ${label} ──`);
  const r = spawnSync(cmd, args, { stdio: 'inherit', env: { ...process.env, NEXT_TELEMETRY_DISABLED: '1' } });
  if (r.status !== 0) {
    console.error(`${label} failed`);
    process.exit(r.status ?? 1);
  }
}

function newestMtime(p: string): number {
  if (!fs.existsSync(p)) return 0;
  const st = fs.statSync(p);
  if (!st.isDirectory()) return st.mtimeMs;
  let m = st.mtimeMs;
  for (const e of fs.readdirSync(p)) if (e !== 'generated' && e !== 'node_modules') m = Math.max(m, newestMtime(path.join(p, e)));
  return m;
}

step('database: migrate', tsx, ['scripts/migrate.ts']);
step('database: seed the demo unit if empty', tsx, ['scripts/seed.ts']);
const buildId = path.join(root, '.next', 'BUILD_ID');
const built = fs.existsSync(buildId) ? fs.statSync(buildId).mtimeMs : 0;
const sources = Math.max(...['app', 'lib', 'prisma', 'next.config.js', 'package-lock.json'].map((p) => newestMtime(path.join(root, p))));
if (sources > built) step('build (next build)', process.execPath, [next, 'build']);
else console.log('\n── build is current ──');

const accountsFile = path.join(dataDir(), 'demo-accounts.json');
const accounts: { username: string; password: string; role: string; displayName: string }[] = fs.existsSync(accountsFile) ? JSON.parse(fs.readFileSync(accountsFile, 'utf8')) : [];
const server = spawn(process.execPath, [next, 'start', '-p', port, '-H', host], { stdio: ['ignore', 'pipe', 'inherit'], env: { ...process.env, NEXT_TELEMETRY_DISABLED: '1' } });
server.stdout.on('data', (d: Buffer) => {
  const s = d.toString();
  process.stdout.write(s);
  if (/Ready|started server/i.test(s)) {
    console.log(`\nPlateau demo (fictional unit, invented data) is at http://${host === '0.0.0.0' ? 'localhost' : host}:${port}`);
    if (accounts.length) {
      console.log('Demo sign-ins (username  password  role):');
      for (const a of accounts) console.log(`  ${a.username.padEnd(16)} ${a.password.padEnd(18)} ${a.role}`);
    }
    console.log('Stop with Ctrl-C.\n');
  }
});
for (const sig of ['SIGINT', 'SIGTERM'] as const) process.on(sig, () => server.kill(sig));
server.on('exit', (code) => process.exit(code ?? 0));
