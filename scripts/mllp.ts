/**
 * `npm run mllp`: the HL7 v2 MLLP listener as its own process.
 * PLATEAU_MLLP_PORT (default 2575), PLATEAU_MLLP_HOST (default 127.0.0.1),
 * PLATEAU_MLLP_ALLOW (comma-separated source addresses, default 127.0.0.1,::1), the database as
 * the app's (PLATEAU_DATABASE_URL, else PLATEAU_DB_FILE),
 * PLATEAU_SUMMARY_DEBOUNCE_MS (default 5000).
 *
 * Case summaries (the episode panel) are recomputed in a child process (forked with the same
 * loader flags), at most once per
 * debounce interval per case: analysing a long case takes tens to hundreds of ms, and on the
 * listener's own thread that would hold up ACKs (measured: p99 send→ACK 5.9 s with 20 rooms when
 * refreshed inline, 32 ms without).
 */
import { fork } from 'node:child_process';
import os from 'node:os';
import { fileURLToPath } from 'node:url';
import { closeDb, openDb, sqlOf } from '../lib/db/client';
import { databaseTarget, describeTarget } from '../lib/db/target';
import { startMllpServer } from '../lib/server/mllpServer';
import { SummaryDebouncer } from '../lib/server/liveBus';

const DEBOUNCE_MS = Number(process.env.PLATEAU_SUMMARY_DEBOUNCE_MS ?? 5000);

/** The summary worker: receives case ids, refreshes each at most once per debounce interval. */
function summaryWorker() {
  const client = openDb(databaseTarget());
  const summaries = new SummaryDebouncer(() => client, DEBOUNCE_MS);
  process.on('message', (m: { caseId?: string; flush?: boolean }) => {
    if (m.caseId) summaries.touch(m.caseId);
    if (m.flush) void summaries.flush().then(() => process.send?.({ flushed: true }));
  });
  process.on('disconnect', () => void summaries.flush().then(() => process.exit(0)));
}

async function main() {
  const target = databaseTarget();
  const client = openDb(target);
  const q = sqlOf(client);
  const worker = fork(fileURLToPath(import.meta.url), [], { env: { ...process.env, PLATEAU_MLLP_ROLE: 'summaries' } });
  // Below the listener in CPU priority: ACK latency matters more than a summary a second sooner.
  if (worker.pid) {
    try {
      os.setPriority(worker.pid, 15);
    } catch {
      /* not permitted: keep the default */
    }
  }
  worker.on('error', (e) => console.error('summary worker failed:', e.message));
  worker.on('exit', (code) => code && console.error(`summary worker exited (${code})`));
  const summaries = {
    touch: (caseId: string) => worker.connected && worker.send({ caseId }),
    flush: () =>
      new Promise<void>((res) => {
        const t = setTimeout(res, 10_000);
        worker.once('message', () => {
          clearTimeout(t);
          res();
        });
        if (worker.connected) worker.send({ flush: true });
        else res();
      }),
  };
  const unit = await q.get<{ timeZone: string }>('SELECT "timeZone" FROM "Unit" ORDER BY "createdAt" LIMIT 1');
  const zoneOffset = unit ? zoneOffsetMinutes(unit.timeZone, new Date()) : 0;
  const port = Number(process.env.PLATEAU_MLLP_PORT ?? 2575);
  const host = process.env.PLATEAU_MLLP_HOST ?? '127.0.0.1';
  const allow = (process.env.PLATEAU_MLLP_ALLOW ?? '127.0.0.1,::1').split(',').map((s) => s.trim()).filter(Boolean);
  const quiet = process.env.PLATEAU_MLLP_QUIET === '1';
  const srv = await startMllpServer(q, {
    port,
    host,
    allow,
    defaultZoneOffsetMinutes: zoneOffset,
    log: (l) => console.log(`${new Date().toISOString()} ${l}`),
    onStored: (r) => {
      if (r.caseId && r.stored > 0) summaries.touch(r.caseId);
      if (!quiet) console.log(`${new Date().toISOString()} ${r.status} ${r.stored} samples${r.caseId ? ` → case ${r.caseId}` : ''}`);
    },
  });
  console.log(`MLLP listener on ${host}:${srv.port} (db ${describeTarget(target)}; allow ${allow.join(', ')})`);
  const stop = async () => {
    await srv.close();
    await summaries.flush();
    await closeDb(client);
    worker.kill('SIGTERM');
    process.exit(0);
  };
  process.on('SIGTERM', () => void stop());
  process.on('SIGINT', () => void stop());
}

/** Minutes east of UTC of a time zone at an instant (for HL7 times sent without a zone). */
function zoneOffsetMinutes(timeZone: string, at: Date): number {
  const parts = new Intl.DateTimeFormat('en-US', { timeZone, hourCycle: 'h23', year: 'numeric', month: '2-digit', day: '2-digit', hour: '2-digit', minute: '2-digit', second: '2-digit' }).formatToParts(at);
  const g = (t: string) => Number(parts.find((p) => p.type === t)?.value);
  const local = Date.UTC(g('year'), g('month') - 1, g('day'), g('hour'), g('minute'), g('second'));
  return Math.round((local - Math.floor(at.getTime() / 1000) * 1000) / 60_000);
}

if (process.env.PLATEAU_MLLP_ROLE !== 'summaries') {
  void main().catch((e: unknown) => {
    console.error(e instanceof Error ? e.message : e);
    process.exit(1);
  });
} else summaryWorker();
