/**
 * Scale benchmark (issue: a year of a large system's cases): on SQLite and on PostgreSQL, at
 * 2,000 / 20,000 / 100,000 signed cases over 24 units and 12 months (tests/bench/volume.ts, with
 * full 1 Hz traces for one case in 500), the time of
 *   - the review headline over every case of the year, all units (loadStatsRows + reviewHeadline),
 *   - one breakdown (by proceduralist, apnea) over the same cases,
 *   - the safety-indicator report of the year for all units (computeReport: 24 periods of charts),
 *   - and, for scale, the lead's review page of one unit-month (loadReview),
 * each the median of 5 runs after a warm-up, and the PostgreSQL / SQLite ratio. Prints figures;
 * not a test. Run: npm run bench -- scale (BENCH_SCALE_SIZES=2000,20000; BENCH_SCALE_DBS=sqlite).
 * PostgreSQL: the server at PLATEAU_BENCH_PG_URL (a role that may create databases), else a
 * throwaway local cluster (scripts/pgServer.mjs).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { applyMigrations } from '@/lib/db/schemaEngine';
import { closeDb, openDb, sqlOf, type Db } from '@/lib/db/client';
import { forgetUnpackedMonths } from '@/lib/db/statsMonths';
import type { Sql } from '@/lib/db/sql';
import { loadStatsRows } from '@/lib/db/statsRows';
import { loadReview, reviewUnit } from '@/lib/db/review';
import { computeReport } from '@/lib/db/indicatorReports';
import { breakdown, figureCatalogue, monthPeriod, reviewHeadline } from '@/lib/review';
import type { DbTarget } from '@/lib/db/target';
import { DEFAULT_SHAPE, RULES, writeVolumeCases, writeVolumeFrame } from './volume';
import { scratchDatabase } from '../../scripts/pgServer.mjs';

const RUNS = 5;

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

/** The first call with nothing unpacked in this process (cold), then the median of RUNS more. */
async function time(q: Sql, f: () => Promise<unknown>): Promise<{ cold: number; warm: number }> {
  forgetUnpackedMonths(q);
  const t0 = performance.now();
  await f();
  const cold = performance.now() - t0;
  const runs: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    await f();
    runs.push(performance.now() - t);
  }
  return { cold, warm: median(runs) };
}

type Figures = Record<string, { cold: number; warm: number }>;

async function measure(client: Db, n: number): Promise<Figures> {
  const year = DEFAULT_SHAPE.lastMonth.slice(0, 4);
  const all = { from: `${year}-01-01`, to: `${year}-12-31`, ruleSetId: 'plateau-default', ruleSetVersion: 1 };
  const rows = await loadStatsRows(client, all);
  if (rows.length !== n) throw new Error(`expected ${n} rows, loaded ${rows.length}`);
  const opts = { responseLimitS: 60, ruleIds: RULES };
  const apnea = figureCatalogue(RULES, 60).find((f) => f.id === 'rule:apnea')!;
  const unit = (await reviewUnit(client, 'unit-00'))!;
  const now = new Date('2030-01-15T12:00:00Z');
  const report = await computeReport(client, { period: year, scope: 'all' }, now);
  if (report.cases !== n) throw new Error(`indicator report counted ${report.cases} cases, expected ${n}`);
  const q = sqlOf(client);
  return {
    headline: await time(q, async () => reviewHeadline(await loadStatsRows(client, all), opts)),
    breakdown: await time(q, async () => breakdown(await loadStatsRows(client, all), 'proceduralist', [apnea])),
    indicators: await time(q, () => computeReport(client, { period: year, scope: 'all' }, now)),
    page: await time(q, () => loadReview(client, unit, { period: monthPeriod(DEFAULT_SHAPE.lastMonth) })),
  };
}

async function pgDatabase(): Promise<{ target: DbTarget; done(): Promise<void> }> {
  const s = await scratchDatabase('plateau_bench', process.env.PLATEAU_BENCH_PG_URL);
  return { target: { dialect: 'postgresql', url: s.url }, done: s.done };
}

const LABELS: Record<string, string> = {
  headline: 'review headline, all units, the year',
  breakdown: 'breakdown by proceduralist, the year',
  indicators: 'indicator report, the year, all units',
  page: "a unit's review page, one month",
};

export async function main(): Promise<void> {
  const sizes = (process.env.BENCH_SCALE_SIZES ?? '2000,20000,100000').split(',').map(Number).sort((a, b) => a - b);
  const dbs = (process.env.BENCH_SCALE_DBS ?? 'sqlite,postgresql').split(',') as DbTarget['dialect'][];
  const results: Record<string, Record<number, Figures>> = {};
  console.log(`scale benchmark: ${DEFAULT_SHAPE.units} units, 12 months, signed cases; 1 Hz traces for one case in ${DEFAULT_SHAPE.tracedEvery}; median of ${RUNS} runs after a warm-up`);
  for (const dialect of dbs) {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-bench-scale-'));
    const pgDb = dialect === 'postgresql' ? await pgDatabase() : null;
    const target: DbTarget = pgDb ? pgDb.target : { dialect: 'sqlite', file: path.join(dir, 'bench.db') };
    try {
      await applyMigrations(target);
      const client = openDb(target);
      const q = sqlOf(client);
      await writeVolumeFrame(q);
      results[dialect] = {};
      let have = 0;
      for (const n of sizes) {
        const t0 = performance.now();
        const { samples } = await writeVolumeCases(q, have, n);
        have = n;
        await q.run(dialect === 'postgresql' ? 'ANALYZE' : 'ANALYZE');
        const wrote = (performance.now() - t0) / 1000;
        const f = await measure(client, n);
        results[dialect][n] = f;
        const rss = process.memoryUsage().rss / 2 ** 20;
        console.log(`\n${dialect} · ${n.toLocaleString('en')} cases (grown in ${wrote.toFixed(1)} s, ${samples.toLocaleString('en')} samples added; bench process RSS ${rss.toFixed(0)} MB)`);
        console.log(`  ${''.padEnd(44)} ${'median'.padStart(9)} ${'first (cold)'.padStart(14)}`);
        for (const k of Object.keys(LABELS)) console.log(`  ${LABELS[k].padEnd(44)} ${f[k].warm.toFixed(0).padStart(6)} ms ${f[k].cold.toFixed(0).padStart(11)} ms`);
      }
      await closeDb(client);
    } finally {
      await pgDb?.done();
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }
  if (results.sqlite && results.postgresql) {
    console.log('\nSQLite / PostgreSQL, median ms, and the ratio PostgreSQL ÷ SQLite (> 1: PostgreSQL slower)');
    console.log(`  ${'query'.padEnd(44)} ${sizes.map((n) => n.toLocaleString('en').padStart(22)).join('')}`);
    for (const k of Object.keys(LABELS)) {
      const cells = sizes.map((n) => `${results.sqlite[n][k].warm.toFixed(0)} / ${results.postgresql[n][k].warm.toFixed(0)} ×${(results.postgresql[n][k].warm / results.sqlite[n][k].warm).toFixed(2)}`.padStart(22));
      console.log(`  ${LABELS[k].padEnd(44)} ${cells.join('')}`);
    }
  }
  const worst = Math.max(...Object.values(results).flatMap((r) => Object.values(r).flatMap((f) => [f.headline.warm, f.breakdown.warm, f.indicators.warm])));
  const worstCold = Math.max(...Object.values(results).flatMap((r) => Object.values(r).flatMap((f) => [f.headline.cold, f.breakdown.cold, f.indicators.cold])));
  console.log(`\nslowest statistics query: median ${worst.toFixed(0)} ms, first call in a fresh process ${worstCold.toFixed(0)} ms (target < 1000 ms at every size)`);
}

if (process.argv[1] && /tests[\\/]bench[\\/]scale\.ts$/.test(process.argv[1])) {
  main().catch((e) => {
    console.error(e);
    process.exit(1);
  });
}
