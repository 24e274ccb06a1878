// Runs every test: unit, then a production build, then integration tests against the built
// server, then browser tests in Debian Chromium. Prints one closing line for CI:
// `tests: N passed, N failed`. Without Chromium the browser tests are skipped LOUDLY; with
// PLATEAU_REQUIRE_BROWSER=1 (set by .ci/run) a missing browser fails the run instead.
import { spawnSync } from 'node:child_process';
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';

const root = process.cwd();
const out = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-results-'));
const vitest = path.join(root, 'node_modules', 'vitest', 'vitest.mjs');
const next = path.join(root, 'node_modules', 'next', 'dist', 'bin', 'next');
const chromium = process.env.PLATEAU_CHROMIUM ?? '/usr/bin/chromium';
const requireBrowser = process.env.PLATEAU_REQUIRE_BROWSER === '1';
const only = process.argv[2]; // optional: unit | integration | e2e

let passed = 0;
let failed = 0;
let skipped = 0;
let ok = true;

function project(name) {
  const file = path.join(out, `${name}.json`);
  const r = spawnSync(process.execPath, [vitest, 'run', '--project', name, '--reporter=default', '--reporter=json', `--outputFile.json=${file}`], { stdio: 'inherit', env: process.env });
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

if (!only || only === 'unit') project('unit');
const needServer = !only || only === 'integration' || only === 'e2e';
const built = needServer && (process.env.PLATEAU_SKIP_BUILD === '1' || build());
if (built && (!only || only === 'integration')) project('integration');
if (built && (!only || only === 'e2e')) {
  if (fs.existsSync(chromium)) {
    project('e2e');
  } else if (requireBrowser) {
    console.error(`\n!!! Chromium not found at ${chromium}: browser tests are required here (PLATEAU_REQUIRE_BROWSER=1) — failing.\n`);
    failed += 1;
    ok = false;
  } else {
    console.warn('\n' + '!'.repeat(78));
    console.warn(`!!! BROWSER TESTS SKIPPED: Chromium not found at ${chromium}.`);
    console.warn('!!! Install it (Debian: apt-get install -y chromium) to run them.');
    console.warn('!'.repeat(78) + '\n');
  }
}

console.log(`tests: ${passed} passed, ${failed} failed${skipped ? `, ${skipped} skipped` : ''}`);
process.exit(ok && failed === 0 ? 0 : 1);
