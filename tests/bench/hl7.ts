/**
 * HL7 feed load: 20 rooms × 1 ORU^R01 per second over MLLP on loopback into the real listener
 * process (`scripts/mllp.ts`, its own process so its CPU and memory can be read from /proc) on a
 * migrated, seeded temporary database. Duration PLATEAU_BENCH_HL7_S (default 60 s; the issue's
 * 10 minutes: PLATEAU_BENCH_HL7_S=600). Prints p50/p99/max send→ACK, lost and duplicated samples,
 * and the listener's CPU share and peak RSS.
 *
 * The database: tests/bench/benchDatabase.ts (SQLite, or PostgreSQL with PLATEAU_BENCH_DIALECT).
 */
import { spawn } from 'node:child_process';
import fs from 'node:fs';
import net from 'node:net';
import path from 'node:path';
import { closeDb, openDb, sqlOf } from '../../lib/db/client';
import { BENCH_DIALECT, ROOT, freePort, makeBenchDatabase } from './benchDatabase';
import { buildOru, readAck } from '../../lib/ingest/hl7';
import { MllpDecoder, mllpFrame } from '../../lib/ingest/mllp';

const ROOMS = 20;

function procStat(pid: number): { cpuS: number; rssMb: number } {
  const stat = fs.readFileSync(`/proc/${pid}/stat`, 'utf8');
  const f = stat.slice(stat.lastIndexOf(')') + 2).split(' ');
  const ticks = Number(f[11]) + Number(f[12]);
  const rss = /VmRSS:\s+(\d+) kB/.exec(fs.readFileSync(`/proc/${pid}/status`, 'utf8'));
  return { cpuS: ticks / 100, rssMb: rss ? Number(rss[1]) / 1024 : NaN };
}

/** The process and its direct children (the listener forks its summary worker). */
function treeStat(pid: number): { cpuS: number; rssMb: number } {
  const pids = [pid];
  for (const e of fs.readdirSync('/proc')) {
    if (!/^\d+$/.test(e)) continue;
    try {
      const st = fs.readFileSync(`/proc/${e}/stat`, 'utf8');
      if (Number(st.slice(st.lastIndexOf(')') + 2).split(' ')[1]) === pid) pids.push(Number(e));
    } catch {
      /* gone */
    }
  }
  return pids.map((p) => procStat(p)).reduce((a, b) => ({ cpuS: a.cpuS + b.cpuS, rssMb: a.rssMb + b.rssMb }));
}

function pct(sorted: number[], p: number): number {
  return sorted[Math.min(sorted.length - 1, Math.floor((p / 100) * sorted.length))];
}

export async function main(): Promise<void> {
  const durationS = Number(process.env.PLATEAU_BENCH_HL7_S ?? 60);
  const database = await makeBenchDatabase('hl7', 30);
  const { env } = database;
  const client = openDb(database.target);
  const q = sqlOf(client);
  const unitId = (await q.get<{ id: string }>('SELECT "id" FROM "Unit" LIMIT 1'))!.id;
  const cases = (await q.all<{ id: string }>('SELECT "id" FROM "Case" ORDER BY "id" LIMIT ?', [ROOMS])).map((c) => c.id);
  const nowAt = new Date();
  await q.tx(async (t) => {
    await t.run(`UPDATE "Case" SET "status" = 'recovery' WHERE "status" = 'in_progress'`);
    for (let r = 0; r < ROOMS; r++) {
      await t.run('INSERT INTO "Room" ("id", "unitId", "name", "location", "sortOrder", "createdAt") VALUES (?, ?, ?, ?, ?, ?)', [`bench-${r}`, unitId, `Bench ${r}`, `BENCH-${r}`, 100 + r, nowAt]);
      await t.run(`UPDATE "Case" SET "status" = 'in_progress', "roomId" = ? WHERE "id" = ?`, [`bench-${r}`, cases[r]]);
      await t.run('INSERT INTO "Device" ("id", "unitId", "roomId", "label", "sendingFacility", "active", "createdAt") VALUES (?, ?, ?, ?, ?, TRUE, ?)', [`bench-dev-${r}`, unitId, `bench-${r}`, `Bench monitor ${r}`, `BENCH-MON-${r}`, nowAt]);
    }
  });
  const port = await freePort();
  const child = spawn(process.execPath, ['--import', 'tsx', path.join(ROOT, 'scripts', 'mllp.ts')], { cwd: ROOT, env: { ...env, PLATEAU_MLLP_PORT: String(port), PLATEAU_MLLP_QUIET: '1' }, stdio: ['ignore', 'pipe', 'pipe'] });
  let log = '';
  child.stdout.on('data', (d) => (log += d));
  child.stderr.on('data', (d) => (log += d));
  const deadline = Date.now() + 30_000;
  while (!log.includes('MLLP listener on')) {
    if (Date.now() > deadline || child.exitCode !== null) throw new Error(`listener did not start:\n${log}`);
    await new Promise((r) => setTimeout(r, 100));
  }
  const pid = child.pid!;
  const cpu0 = treeStat(pid).cpuS;
  const main0 = procStat(pid).cpuS;
  const wall0 = Date.now();
  let peakRss = treeStat(pid).rssMb;
  let peakMainRss = procStat(pid).rssMb;
  const rssTimer = setInterval(() => {
    peakRss = Math.max(peakRss, treeStat(pid).rssMb);
    peakMainRss = Math.max(peakMainRss, procStat(pid).rssMb);
  }, 1000);

  const latencies: number[] = [];
  const codes = new Map<string, number>();
  const t0 = Date.UTC(2026, 0, 1, 8, 0, 0);
  const sender = async (r: number) => {
    const sock = net.connect({ port, host: '127.0.0.1' });
    await new Promise<void>((res, rej) => {
      sock.once('connect', () => res());
      sock.once('error', rej);
    });
    sock.setNoDelay(true);
    const d = new MllpDecoder();
    const waiting: ((s: string) => void)[] = [];
    sock.on('data', (c) => d.push(c).forEach((e) => e.kind === 'message' && waiting.shift()?.(e.text)));
    await new Promise((res) => setTimeout(res, (1000 / ROOMS) * r));
    const start = Date.now();
    for (let i = 0; i < durationS; i++) {
      const msg = buildOru({ controlId: `B${r}-${i}`, at: new Date(t0 + i * 1000), sendingFacility: `BENCH-MON-${r}`, location: `BENCH-${r}`, values: { etco2: 35 + (i % 8), rr: 10 + (i % 6), spo2: 94 + (i % 6), hr: 60 + (i % 30) } });
      const sent = performance.now();
      const ack = await new Promise<string>((res) => {
        waiting.push(res);
        sock.write(mllpFrame(msg));
      });
      latencies.push(performance.now() - sent);
      const code = readAck(ack).code;
      codes.set(code, (codes.get(code) ?? 0) + 1);
      const wait = start + (i + 1) * 1000 - Date.now();
      if (wait > 0) await new Promise((res) => setTimeout(res, wait));
    }
    sock.destroy();
  };
  console.log(`hl7: ${ROOMS} rooms × 1 msg/s × ${durationS} s over MLLP loopback (4 samples per message) on ${BENCH_DIALECT}…`);
  await Promise.all(Array.from({ length: ROOMS }, (_, r) => sender(r)));
  clearInterval(rssTimer);
  const wallS = (Date.now() - wall0) / 1000;
  const cpuS = treeStat(pid).cpuS - cpu0;
  const mainCpuS = procStat(pid).cpuS - main0;
  child.kill('SIGTERM');
  await new Promise((r) => child.once('exit', r));

  const expected = ROOMS * durationS * 4;
  const ph = cases.map(() => '?').join(', ');
  const window = [...cases, t0, t0 + durationS * 1000];
  const stored = Number((await q.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM "Sample" WHERE "source" = 'monitor' AND "caseId" IN (${ph}) AND "atMs" >= ? AND "atMs" < ?`, window))!.n);
  const distinct = Number(
    (await q.get<{ n: number }>(`SELECT COUNT(*) AS "n" FROM (SELECT DISTINCT "caseId", "channel", "atMs" FROM "Sample" WHERE "source" = 'monitor' AND "caseId" IN (${ph}) AND "atMs" >= ? AND "atMs" < ?) AS "d"`, window))!.n,
  );
  const msgs = await q.all<{ status: string; n: number }>('SELECT "status", COUNT(*) AS "n" FROM "Hl7Message" GROUP BY "status" ORDER BY "status"');
  await closeDb(client);
  await database.drop();
  const s = [...latencies].sort((a, b) => a - b);
  console.log(`messages sent ${latencies.length}, ACKs ${[...codes].map(([c, n]) => `${c} ${n}`).join(', ')}; stored messages ${msgs.map((m) => `${m.status} ${m.n}`).join(', ')}`);
  console.log(`samples expected ${expected}, stored ${stored}, lost ${expected - distinct}, duplicated ${stored - distinct}`);
  console.log(`send→ACK p50 ${pct(s, 50).toFixed(2)} ms, p99 ${pct(s, 99).toFixed(2)} ms, max ${s[s.length - 1].toFixed(2)} ms (target p99 < 50 ms: ${pct(s, 99) < 50 ? 'met' : 'NOT met'})`);
  console.log(`listener CPU ${((mainCpuS / wallS) * 100).toFixed(1)} % of one core, with its summary worker ${((cpuS / wallS) * 100).toFixed(1)} % (${cpuS.toFixed(1)} s in ${wallS.toFixed(0)} s); peak RSS listener ${peakMainRss.toFixed(0)} MB, with worker ${peakRss.toFixed(0)} MB`);
  if (expected !== distinct || stored !== distinct) process.exitCode = 1;
}

if (process.argv[1] && process.argv[1].endsWith('hl7.ts')) void main();
