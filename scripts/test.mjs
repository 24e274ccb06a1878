// Runs every test: unit, then a production build, then against the built server the integration
// suite and the browser tests (Debian Chromium) on SQLite, then both again on PostgreSQL. Prints one
// closing line for CI: `tests: N passed, N failed`.
// PostgreSQL: the server at PLATEAU_TEST_PG_URL (a role that may create databases), else a
// throwaway cluster started here from Debian's postgresql packages (scripts/pgServer.mjs).
// Without Chromium or PostgreSQL those tests are skipped LOUDLY; with PLATEAU_REQUIRE_BROWSER=1 /
// PLATEAU_REQUIRE_POSTGRES=1 (both set by .ci/run) a missing one fails the run instead.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { postgresBinDir, startTempPostgres } from './pgServer.mjs';

const root = process.cwd();
const out = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-results-'));
const vitest = path.join(root, 'node_modules', 'vitest', 'vitest.mjs');
const next = path.join(root, 'node_modules', 'next', 'dist', 'bin', 'next');
const chromium = process.env.PLATEAU_CHROMIUM ?? '/usr/bin/chromium';
const requireBrowser = process.env.PLATEAU_REQUIRE_BROWSER === '1';
const requirePostgres = process.env.PLATEAU_REQUIRE_POSTGRES === '1';
const only = process.argv[2]; // optional: unit | integration | integration-sqlite | integration-postgresql | e2e | e2e-sqlite | e2e-postgresql

let passed = 0;
let failed = 0;
let skipped = 0;
let ok = true;

function project(name, env = process.env, label = name) {
  const file = path.join(out, `${label}.json`);
  const r = spawnSync(process.execPath, [vitest, 'run', '--project', name, '--reporter=default', '--reporter=json', `--outputFile.json=${file}`], { stdio: 'inherit', env });
  if (fs.existsSync(file)) {
    const j = JSON.parse(fs.readFileSync(file, 'utf8'));
    passed += j.numPassedTests ?? 0;
    failed += j.numFailedTests ?? 0;
    skipped += (j.numPendingTests ?? 0) + (j.numTodoTests ?? 0);
    if ((j.numFailedTestSuites ?? 0) > 0 && (j.numFailedTests ?? 0) === 0) failed += j.numFailedTestSuites;
  } else {
    failed += 1;
  }
  if (r.status !== 0) ok = false;
}

function build() {
  console.log('\n── building the app for integration and browser tests (next build) ──');
  const r = spawnSync(process.execPath, [next, 'build'], { stdio: 'inherit', env: { ...process.env, NEXT_TELEMETRY_DISABLED: '1' } });
  if (r.status !== 0) {
    console.error('next build failed: integration and browser tests cannot run');
    failed += 1;
    ok = false;
    return false;
  }
  return true;
}

function loud(lines) {
  console.warn('\n' + '!'.repeat(78));
  for (const l of lines) console.warn(`!!! ${l}`);
  console.warn('!'.repeat(78) + '\n');
}

/** Whether the browser tests can run here (fails the run, once, when required and missing). */
let browserMissingSaid = false;
function browserAvailable() {
  if (fs.existsSync(chromium)) return true;
  if (browserMissingSaid) return false;
  browserMissingSaid = true;
  if (requireBrowser) {
    console.error(`\n!!! Chromium not found at ${chromium}: browser tests are required here (PLATEAU_REQUIRE_BROWSER=1) — failing.\n`);
    failed += 1;
    ok = false;
  } else {
    loud([`BROWSER TESTS SKIPPED: Chromium not found at ${chromium}.`, 'Install it (Debian: apt-get install -y chromium) to run them.']);
  }
  return false;
}

/** The integration suite, then the browser tests, on one PostgreSQL server (each test makes its own database). */
async function onPostgres({ integration, e2e }) {
  let url = process.env.PLATEAU_TEST_PG_URL;
  let server = null;
  if (!url) {
    if (!postgresBinDir()) {
      if (requirePostgres) {
        console.error('\n!!! PostgreSQL not found: the PostgreSQL runs are required here (PLATEAU_REQUIRE_POSTGRES=1) — failing.\n');
        failed += 1;
        ok = false;
      } else loud(['TESTS ON POSTGRESQL SKIPPED: no PostgreSQL server programs found.', 'Install them (Debian: apt-get install -y postgresql) or set PLATEAU_TEST_PG_URL.']);
      return;
    }
    console.log('\n── starting a throwaway PostgreSQL server (scripts/pgServer.mjs) ──');
    server = await startTempPostgres();
    url = server.url;
  }
  const env = { ...process.env, PLATEAU_TEST_DIALECT: 'postgresql', PLATEAU_TEST_PG_URL: url };
  const shown = url.replace(/:[^:@/]*@/, ':***@');
  try {
    if (integration) {
      console.log(`\n── integration tests on PostgreSQL (${shown}) ──`);
      project('integration', env, 'integration-postgresql');
    }
    if (e2e && browserAvailable()) {
      console.log(`\n── browser tests on PostgreSQL (${shown}) ──`);
      project('e2e', env, 'e2e-postgresql');
    }
  } finally {
    server?.stop();
  }
}

if (!only || only === 'unit') project('unit');
const needServer = !only || only.startsWith('integration') || only.startsWith('e2e');
const built = needServer && (process.env.PLATEAU_SKIP_BUILD === '1' || build());
const wants = (name) => !only || only === name || only === name.split('-')[0];
if (built && wants('integration-sqlite')) {
  console.log('\n── integration tests on SQLite ──');
  project('integration', { ...process.env, PLATEAU_TEST_DIALECT: 'sqlite' }, 'integration-sqlite');
}
if (built && wants('e2e-sqlite') && browserAvailable()) {
  console.log('\n── browser tests on SQLite ──');
  project('e2e', { ...process.env, PLATEAU_TEST_DIALECT: 'sqlite' }, 'e2e-sqlite');
}
if (built && (wants('integration-postgresql') || wants('e2e-postgresql'))) await onPostgres({ integration: wants('integration-postgresql'), e2e: wants('e2e-postgresql') });

console.log(`tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(ok && failed === 0 ? 0 : 1);
