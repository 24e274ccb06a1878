/**
 * Load: N simulated users (default 50) doing bedside entry — doses, vitals and interventions,
 * plus the case sheet's 2.5 s poll — against the production build on loopback.
 *
 *   npm run bench:load                      60 s (PLATEAU_LOAD_SECONDS=300 for the 5-minute run)
 *   PLATEAU_LOAD_USERS=50 PLATEAU_LOAD_THINK_MS=1000 …
 *   PLATEAU_LOAD_POLL_MS=2500         the sheet poll interval (0: no polls)
 *   PLATEAU_LOAD_PROFILE=/tmp/prof   the server writes a V8 CPU profile there (open in Chrome DevTools)
 *
 * Prints requests, errors, lost writes (acknowledged but not in the database), p50/p95/p99
 * latency of writes and polls, and the server's resident memory (start, peak, end).
 * Needs `npm run build` first (PLATEAU_NEXT_DIST for another build folder). The database:
 * tests/bench/benchDatabase.ts (SQLite, or PostgreSQL with PLATEAU_BENCH_DIALECT=postgresql).
 */
import { randomUUID } from 'node:crypto';
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import path from 'node:path';
import { pathToFileURL } from 'node:url';
import { Client } from '../helpers/client';
import { closeDb, openDb, sqlOf } from '../../lib/db/client';
import { BENCH_DIALECT, ROOT, benchAccounts, freePort, makeBenchDatabase } from './benchDatabase';

const KINDS = ['stimulation', 'chin_lift', 'jaw_thrust', 'oxygen_increase'];

function rssKb(pid: number): number {
  // The server process and any children it forked.
  let total = 0;
  const stack = [pid];
  while (stack.length) {
    const p = stack.pop()!;
    try {
      const m = /VmRSS:\s+(\d+)/.exec(fs.readFileSync(`/proc/${p}/status`, 'utf8'));
      total += m ? Number(m[1]) : 0;
      const kids = fs.readFileSync(`/proc/${p}/task/${p}/children`, 'utf8').trim();
      if (kids) stack.push(...kids.split(/\s+/).map(Number));
    } catch {
      /* gone */
    }
  }
  return total;
}

/** CPU seconds (user + system) of a process so far. */
function cpuSeconds(pid: number): number {
  try {
    const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
    const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
    return (Number(f[11]) + Number(f[12])) / 100;
  } catch {
    return NaN;
  }
}

const pct = (xs: number[], p: number) => {
  if (!xs.length) return NaN;
  const s = [...xs].sort((a, b) => a - b);
  return s[Math.min(s.length - 1, Math.ceil((p / 100) * s.length) - 1)];
};

export interface LoadResult {
  users: number;
  seconds: number;
  writes: number;
  polls: number;
  errors: number;
  lost: number;
  writeP50: number;
  writeP99: number;
  pollP99: number;
  rssStartMb: number;
  rssPeakMb: number;
  rssEndMb: number;
}

export async function main(): Promise<LoadResult> {
  const users = Number(process.env.PLATEAU_LOAD_USERS ?? 50);
  const seconds = Number(process.env.PLATEAU_LOAD_SECONDS ?? 60);
  const think = Number(process.env.PLATEAU_LOAD_THINK_MS ?? 1000);
  // The bedside sheet polls every 2.5 s; 0 leaves the polls out (to weigh writes alone).
  const pollMs_ = Number(process.env.PLATEAU_LOAD_POLL_MS ?? 2500);
  const dist = process.env.PLATEAU_NEXT_DIST || '.next';
  if (!fs.existsSync(path.join(ROOT, dist, 'BUILD_ID'))) throw new Error(`no production build in ${dist}: run npm run build`);
  const d = await makeBenchDatabase('load', 1);
  const port = await freePort();
  // PLATEAU_LOAD_PROFILE=<dir>: the server writes a V8 CPU profile there when it stops.
  const profile = process.env.PLATEAU_LOAD_PROFILE ? ['--cpu-prof', `--cpu-prof-dir=${process.env.PLATEAU_LOAD_PROFILE}`] : [];
  const child = spawn(process.execPath, [...profile, path.join(ROOT, 'node_modules', 'next', 'dist', 'bin', 'next'), 'start', '-p', String(port), '-H', '127.0.0.1'], { cwd: ROOT, env: { ...d.env, PORT: String(port) }, stdio: 'ignore' });
  const url = `http://127.0.0.1:${port}`;
  try {
    for (let i = 0; ; i++) {
      try {
        if ((await fetch(`${url}/api/health`)).status === 200) break;
      } catch {
        /* starting */
      }
      if (i > 300) throw new Error('server did not start');
      await new Promise((r) => setTimeout(r, 200));
    }
    const nurses = benchAccounts(d).filter((a) => a.role === 'nurse' || a.role === 'lead');
    // One case per two users, as in a room with a nurse and a colleague.
    const clients: Client[] = [];
    for (let u = 0; u < users; u++) {
      const c = new Client(url);
      const a = nurses[u % nurses.length];
      await c.signIn(a.username, a.password);
      clients.push(c);
    }
    const cases: string[] = [];
    for (let i = 0; i < Math.ceil(users / 2); i++) {
      const r = await clients[i * 2].post('/api/v1/cases', { patient: { mrn: `L-${randomUUID().slice(0, 8)}`, familyName: 'Load', givenName: `User${i}`, birthDate: '1970-01-01', sex: i % 2 ? 'male' : 'female' }, procedureType: 'colonoscopy', roomId: 'room-1', plannedDepth: 'moderate' });
      if (r.status !== 201) throw new Error(`could not open a case: ${r.status} ${r.text}`);
      cases.push(r.json.id);
    }
    // Warm up the routes (first-hit compilation of server chunks) before measuring.
    for (const c of cases.slice(0, 2)) await clients[0].get(`/api/v1/cases/${c}/sheet`);

    const writeMs: number[] = [];
    const pollMs: number[] = [];
    const acked: string[] = [];
    let errors = 0;
    const firstErrors: string[] = [];
    const rss0 = rssKb(child.pid!);
    const cpu0 = cpuSeconds(child.pid!);
    const wall0 = Date.now();
    let peak = rss0;
    const memTimer = setInterval(() => (peak = Math.max(peak, rssKb(child.pid!))), 500);
    const end = Date.now() + seconds * 1000;
    const t0 = Date.UTC(2026, 0, 1, 8);
    let seq = 0;
    const user = async (u: number) => {
      const c = clients[u];
      const caseId = cases[Math.floor(u / 2)];
      let lastPoll = 0;
      await new Promise((r) => setTimeout(r, Math.random() * think));
      while (Date.now() < end) {
        const id = randomUUID();
        const at = new Date(t0 + seq++ * 1000).toISOString();
        const k = seq % 3;
        const body = k === 0 ? { type: 'dose', id, at, drugId: 'drug-propofol', amount: 10 + (seq % 20), unit: 'mg', route: 'IV' } : k === 1 ? { type: 'vital', id, at, hr: 60 + (seq % 40), spo2: 90 + (seq % 10), rr: 12 } : { type: 'intervention', id, at, kind: KINDS[seq % KINDS.length] };
        const s = performance.now();
        try {
          const r = await c.post(`/api/v1/cases/${caseId}/entries`, body);
          writeMs.push(performance.now() - s);
          if (r.status === 201) acked.push(id);
          else {
            errors++;
            if (firstErrors.length < 5) firstErrors.push(`${r.status} ${r.text.slice(0, 200)}`);
          }
        } catch (e) {
          errors++;
          if (firstErrors.length < 5) firstErrors.push(String(e));
        }
        if (pollMs_ > 0 && Date.now() - lastPoll > pollMs_) {
          lastPoll = Date.now();
          const p = performance.now();
          const r = await c.get(`/api/v1/cases/${caseId}/sheet`).catch(() => ({ status: 0 }));
          pollMs.push(performance.now() - p);
          if (r.status !== 200) errors++;
        }
        await new Promise((r) => setTimeout(r, think * (0.5 + Math.random())));
      }
    };
    await Promise.all(clients.map((_, u) => user(u)));
    clearInterval(memTimer);
    const rssEnd = rssKb(child.pid!);
    const cpuShare = (cpuSeconds(child.pid!) - cpu0) / ((Date.now() - wall0) / 1000);

    const reader = openDb(d.target);
    const stored = new Set((await sqlOf(reader).all<{ id: string }>('SELECT "id" FROM "Dose" UNION ALL SELECT "id" FROM "ManualVital" UNION ALL SELECT "id" FROM "Intervention"')).map((r) => r.id));
    await closeDb(reader);
    const lost = acked.filter((id) => !stored.has(id)).length;
    const res: LoadResult = {
      users,
      seconds,
      writes: writeMs.length,
      polls: pollMs.length,
      errors,
      lost,
      writeP50: pct(writeMs, 50),
      writeP99: pct(writeMs, 99),
      pollP99: pct(pollMs, 99),
      rssStartMb: rss0 / 1024,
      rssPeakMb: peak / 1024,
      rssEndMb: rssEnd / 1024,
    };
    const f = (x: number) => x.toFixed(1);
    console.log(`load on ${BENCH_DIALECT}: ${users} users, ${seconds} s, think ${think} ms: ${res.writes} writes (${f(res.writes / seconds)}/s), ${res.polls} sheet polls`);
    console.log(`  errors ${errors}, lost writes ${lost} (${acked.length} acknowledged, all counted in the database)`);
    console.log(`  write latency p50 ${f(res.writeP50)} ms, p95 ${f(pct(writeMs, 95))} ms, p99 ${f(res.writeP99)} ms (target < 200); sheet poll p50 ${f(pct(pollMs, 50))} ms, p99 ${f(res.pollP99)} ms`);
    console.log(`  server memory (RSS): start ${f(res.rssStartMb)} MB, peak ${f(res.rssPeakMb)} MB, end ${f(res.rssEndMb)} MB; server CPU ${(cpuShare * 100).toFixed(0)} % of one core`);
    if (firstErrors.length) console.log(`  first errors: ${firstErrors.join(' | ')}`);
    return res;
  } finally {
    child.kill('SIGTERM');
    await new Promise((r) => setTimeout(r, process.env.PLATEAU_LOAD_PROFILE ? 5000 : 300));
    if (child.exitCode === null) child.kill('SIGKILL');
    await d.drop();
  }
}

if (process.argv[1] && import.meta.url === pathToFileURL(path.resolve(process.argv[1])).href) {
  main().then(
    (r) => process.exit(r.errors === 0 && r.lost === 0 ? 0 : 1),
    (e) => {
      console.error(e);
      process.exit(1);
    },
  );
}
