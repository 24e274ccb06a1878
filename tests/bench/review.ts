/**
 * Benchmark for the monthly review: how long the headline and a breakdown take at 2,000,
 * 20,000 and 100,000 cases, and how long the whole review of a 2,000-case month takes (its
 * page loads the month and the six months before it). Rows are summary-only synthetic cases
 * written by raw inserts into a temporary SQLite database (no 1 Hz traces: statistics never
 * read samples). Prints figures; not a test. Run: npx tsx tests/bench/review.ts
 * (BENCH_REVIEW_SIZES=2000,20000 to pick sizes).
 */
import fs from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { performance } from 'node:perf_hooks';
import { applyMigrations } from '@/lib/db/schemaEngine';
import { openRawDatabase, isoDb } from '@/lib/db/sqlite';
import { openDb } from '@/lib/db/client';
import { loadStatsRows } from '@/lib/db/statsRows';
import { PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { loadReview, reviewUnit } from '@/lib/db/review';
import { breakdown, breakdowns, figureCatalogue, monthPeriod, reviewHeadline, shiftMonth, DIMENSIONS } from '@/lib/review';

const CASES_PER_MONTH = 2000;
const RUNS = 5;
const RULES = PLATEAU_DEFAULT_V1.rules.map((r) => r.id);
const RULE_P: Record<string, number> = { apnea: 0.22, prolonged_apnea: 0.015, hypoventilation: 0.08, low_etco2: 0.01, bradypnea: 0.06, hypoxemia: 0.1, severe_hypoxemia: 0.03, prolonged_hypoxemia: 0.01, critical_hypoxemia: 0.002 };
const PROCEDURES = ['gastroscopy', 'colonoscopy', 'ercp', 'eus', 'bronchoscopy'];
const DRUGS = [['propofol'], ['propofol', 'fentanyl'], ['midazolam', 'fentanyl'], ['ketamine']];
const KINDS = ['stimulation', 'jaw_thrust', 'oxygen_increase', 'chin_lift', 'bag_mask'];

/** Deterministic PRNG (mulberry32) so runs are comparable. */
function random(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

/** Writes `cases` signed cases, CASES_PER_MONTH a month ending with `lastMonth`, with summaries of plateau-default v1. */
export function writeSynthetic(file: string, cases: number, lastMonth: string): void {
  const db = openRawDatabase(file);
  const rnd = random(cases);
  const pick = <T>(xs: readonly T[]) => xs[Math.floor(rnd() * xs.length)];
  const now = isoDb(new Date('2030-01-01T00:00:00Z'));
  const months = Math.ceil(cases / CASES_PER_MONTH);
  const firstMonth = shiftMonth(lastMonth, -(months - 1));
  db.transaction(() => {
    db.prepare('INSERT INTO Site (id, name, createdAt) VALUES (?, ?, ?)').run('site-bench', 'Bench site', now);
    db.prepare('INSERT INTO Unit (id, siteId, name, timeZone, createdAt) VALUES (?, ?, ?, ?, ?)').run('bench', 'site-bench', 'Bench unit', 'UTC', now);
    for (let i = 1; i <= 6; i++) db.prepare('INSERT INTO Room (id, unitId, name, sortOrder, createdAt) VALUES (?, ?, ?, ?, ?)').run(`room-${i}`, 'bench', `Room ${i}`, i, now);
    for (let i = 1; i <= 30; i++) db.prepare('INSERT INTO "User" (id, username, displayName, role, passwordHash, unitId, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?)').run(`nurse-${i}`, `nurse.${i}`, `Nurse ${i}`, 'nurse', 'x', 'bench', now);
    for (let i = 1; i <= 25; i++) db.prepare('INSERT INTO Proceduralist (id, unitId, name, createdAt) VALUES (?, ?, ?, ?)').run(`dr-${i}`, 'bench', `Dr ${i}`, now);
    const patients = Math.max(100, Math.floor(cases / 2));
    const pat = db.prepare('INSERT INTO Patient (id, siteId, mrn, familyName, givenName, birthDate, sex, createdAt) VALUES (?, ?, ?, ?, ?, ?, ?, ?)');
    for (let i = 0; i < patients; i++) pat.run(`pat-${i}`, 'site-bench', `B-${i}`, 'Bench', 'Patient', `${1930 + Math.floor(rnd() * 75)}-0${1 + Math.floor(rnd() * 9)}-15`, rnd() < 0.5 ? 'female' : 'male', now);
    const cs = db.prepare(`INSERT INTO "Case" (id, key, patientId, unitId, roomId, procedureType, plannedDepth, asaClass, asaEmergency, weightKg, heightCm, sbSnoring, sbTired, sbObserved, sbPressure, sbNeck,
      proceduralistId, nurseId, status, scheduledDate, startAt, etco2Unit, version, createdAt, updatedAt) VALUES (?, ?, ?, 'bench', ?, ?, ?, ?, 0, ?, ?, ?, ?, ?, ?, ?, ?, ?, 'signed', ?, ?, 'mmHg', 1, ?, ?)`);
    const dose = db.prepare('INSERT INTO Dose (id, caseId, drug, drugClass, amount, unit, route, at, createdAt) VALUES (?, ?, ?, ?, 20, ?, ?, ?, ?)');
    const iv = db.prepare('INSERT INTO Intervention (id, caseId, kind, at, createdAt) VALUES (?, ?, ?, ?, ?)');
    const ev = db.prepare('INSERT INTO CaseEvent (id, caseId, kind, at, createdAt) VALUES (?, ?, ?, ?, ?)');
    const mv = db.prepare('INSERT INTO ManualVital (id, caseId, at, sbp, dbp, hr, createdAt) VALUES (?, ?, ?, 120, 70, 80, ?)');
    const sum = db.prepare(`INSERT INTO CaseSummary (id, caseId, ruleSetId, ruleSetVersion, inputHash, computedAt, caseLevel, majorPhysiology, episodeCount, lowestSpo2, capnoCoveragePct, sedationS, firstApneaResponseS, analysisJson)
      VALUES (?, ?, 'plateau-default', 1, 'bench', ?, ?, ?, ?, ?, 100, 900, ?, '{}')`);
    const rule = db.prepare('INSERT INTO CaseSummaryRule (summaryId, caseId, ruleId, episodes, totalDurationS, maxDurationS, firstResponseS) VALUES (?, ?, ?, ?, ?, ?, ?)');
    for (let i = 0; i < cases; i++) {
      const month = shiftMonth(firstMonth, Math.floor(i / CASES_PER_MONTH));
      const day = 1 + Math.floor(((i % CASES_PER_MONTH) / CASES_PER_MONTH) * 28);
      const date = `${month}-${String(day).padStart(2, '0')}`;
      const startMs = Date.parse(`${date}T08:00:00Z`) + (i % 40) * 600_000;
      const at = (s: number) => isoDb(new Date(startMs + s * 1000));
      const id = `case-${i}`;
      cs.run(id, `b-${i}`, `pat-${Math.floor(rnd() * patients)}`, pick(['room-1', 'room-2', 'room-3', 'room-4', 'room-5', 'room-6']), pick(PROCEDURES), pick(['minimal', 'moderate', 'moderate', 'deep']), pick(['I', 'II', 'II', 'III', 'IV']), 50 + rnd() * 70, 150 + rnd() * 40,
        rnd() < 0.4 ? 1 : 0, rnd() < 0.3 ? 1 : 0, rnd() < 0.1 ? 1 : 0, rnd() < 0.4 ? 1 : 0, rnd() < 0.2 ? 1 : 0, `dr-${1 + Math.floor(rnd() * 25)}`, `nurse-${1 + Math.floor(rnd() * 30)}`, date, isoDb(new Date(startMs)), now, now);
      const drugs = pick(DRUGS);
      drugs.forEach((d, k) => dose.run(`${id}-d${k}`, id, d, d === 'fentanyl' ? 'opioid' : 'sedative', d === 'fentanyl' ? 'mcg' : 'mg', 'IV', at(60 + k * 30), now));
      dose.run(`${id}-d9`, id, drugs[0], 'sedative', 'mg', 'IV', at(400), now);
      ['sedation_start', 'procedure_start', 'procedure_end', 'recovery_start', 'sedation_end', 'discharge'].forEach((k, j) => ev.run(`${id}-e${j}`, id, k, at(j * 300), now));
      for (let v = 0; v < 5; v++) mv.run(`${id}-v${v}`, id, at(v * 300), now);
      const episodes = RULES.map((r) => (rnd() < RULE_P[r] ? 1 + Math.floor(rnd() * 2) : 0));
      const count = episodes.reduce((a, b) => a + b, 0);
      const intervened = count > 0 && rnd() < 0.7;
      if (intervened) iv.run(`${id}-i0`, id, pick(KINDS), at(500), now);
      const level = count === 0 ? (intervened ? 'corrected' : 'none') : !intervened ? 'observed' : rnd() < 0.04 ? 'supported' : 'corrected';
      const major = episodes[1] > 0 || episodes[7] > 0 || episodes[8] > 0;
      const response = episodes[0] > 0 && intervened ? Math.round(5 + rnd() * 80) : null;
      const sid = `${id}:plateau-default:1`;
      sum.run(sid, id, now, level, major ? 1 : 0, count, 85 + Math.round(rnd() * 14), response);
      RULES.forEach((r, k) => rule.run(sid, id, r, episodes[k], episodes[k] * 30, episodes[k] ? 30 : 0, episodes[k] && k === 0 ? response : null));
    }
  })();
  db.close();
}

function median(xs: number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
}

async function time(label: string, f: () => Promise<unknown> | unknown): Promise<number> {
  await f(); // warm up
  const runs: number[] = [];
  for (let i = 0; i < RUNS; i++) {
    const t = performance.now();
    await f();
    runs.push(performance.now() - t);
  }
  const ms = median(runs);
  console.log(`${label.padEnd(72)} ${ms.toFixed(1).padStart(9)} ms`);
  return ms;
}

export async function main(): Promise<void> {
  const sizes = (process.env.BENCH_REVIEW_SIZES ?? '2000,20000,100000').split(',').map(Number);
  const lastMonth = '2029-12';
  const opts = { responseLimitS: 60, ruleIds: RULES };
  const figures = figureCatalogue(RULES, 60);
  const apnea = figures.find((f) => f.id === 'rule:apnea')!;
  console.log(`review benchmark: summary-only synthetic cases, ${CASES_PER_MONTH.toLocaleString('en')} a month; median of ${RUNS} runs after a warm-up`);
  for (const n of sizes) {
    const dir = fs.mkdtempSync(path.join(os.tmpdir(), 'plateau-bench-review-'));
    const file = path.join(dir, 'bench.db');
    try {
      await applyMigrations(file);
      const t0 = performance.now();
      writeSynthetic(file, n, lastMonth);
      console.log(`\n${n.toLocaleString('en')} cases (written in ${((performance.now() - t0) / 1000).toFixed(1)} s)`);
      const client = openDb(file);
      const months = Math.ceil(n / CASES_PER_MONTH);
      const all = { from: `${shiftMonth(lastMonth, -(months - 1))}-01`, to: `${lastMonth}-31`, ruleSetId: 'plateau-default', ruleSetVersion: 1 };
      const rows = await loadStatsRows(client, all);
      if (rows.length !== n) throw new Error(`expected ${n} rows, loaded ${rows.length}`);
      await time(`loadStatsRows, all ${n.toLocaleString('en')} cases`, () => loadStatsRows(client, all));
      await time(`headline (reviewHeadline) over ${n.toLocaleString('en')} loaded rows`, () => reviewHeadline(rows, opts));
      await time(`breakdown by proceduralist (apnea) over ${n.toLocaleString('en')} rows`, () => breakdown(rows, 'proceduralist', [apnea]));
      await time(`all 10 breakdowns × ${figures.length} figures over ${n.toLocaleString('en')} rows`, () => breakdowns(rows, DIMENSIONS, figures));
      await time(`headline query: load + headline, all ${n.toLocaleString('en')} cases`, async () => reviewHeadline(await loadStatsRows(client, all), opts));
      await time(`breakdown query: load + breakdown by proceduralist, ${n.toLocaleString('en')}`, async () => breakdown(await loadStatsRows(client, all), 'proceduralist', [apnea]));
      const unit = (await reviewUnit(client, 'bench'))!;
      await time(`review page data (loadReview): the last 2,000-case month, 12-month trend`, () => loadReview(client, unit, { period: monthPeriod(lastMonth) }));
      await client.$disconnect();
    } finally {
      fs.rmSync(dir, { recursive: true, force: true });
    }
  }
}

// Run when executed directly (the bench runner imports main()).
if (process.argv[1] && /tests[\\/]bench[\\/]review\.ts$/.test(process.argv[1])) {
  main().catch((e) => {
    console.error(e);
    process.exit(1);
  });
}
