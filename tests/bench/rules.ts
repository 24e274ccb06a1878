/**
 * Rules-engine benchmark (prints figures; not a test). Run alone with `npx tsx tests/bench/rules.ts`
 * or with the others through `npm run bench`.
 *
 * 1. Throughput: samples analysed per second by `analyzeCase` with the whole plateau-default rule
 *    set on 1 Hz three-channel synthetic one-hour cases (best of several timed passes, so other
 *    load on the machine shows less).
 * 2. Peak RSS while 1,000 one-hour cases are generated and analysed in turn.
 * 3. The same five absolute rules in a straightforward pandas and a vectorised numpy version
 *    (tests/bench/rules_pandas.py, rules_numpy.py, run by /usr/bin/python3) on the same cases written
 *    as CSV, timing detection only, against ours on those rules (our time is the whole
 *    analyzeCase). Episode counts are cross-checked.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import os from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';
import { analyzeCase, PLATEAU_DEFAULT_V1, type RuleSet } from '../../lib/rules';
import type { CaseRecord } from '../../lib/domain/caseRecord';
import { sampleCount, syntheticCase } from './syntheticCase';

const PYTHON = '/usr/bin/python3';
const HERE = path.dirname(fileURLToPath(import.meta.url));
const FIVE_RULE_IDS = ['apnea', 'prolonged_apnea', 'bradypnea', 'hypoxemia', 'severe_hypoxemia'];

/** The five absolute rules the Python versions implement, taken from plateau-default. */
export const FIVE_ABSOLUTE_RULES: RuleSet = {
  id: 'bench-five-absolute',
  version: 1,
  description: 'Five absolute plateau-default rules, for the pandas / numpy comparison.',
  rules: PLATEAU_DEFAULT_V1.rules.filter((r) => FIVE_RULE_IDS.includes(r.id)),
};

/** Best (shortest), median and mean seconds for one pass of `analyzeCase` over all cases. */
function timePasses(cases: CaseRecord[], ruleSet: RuleSet, budgetMs: number): { best: number; median: number; mean: number; passes: number } {
  for (let w = 0; w < 3; w++) for (const c of cases) analyzeCase(c, ruleSet); // warm up the JIT
  const times: number[] = [];
  const until = performance.now() + budgetMs;
  while (times.length < 3 || performance.now() < until) {
    const t0 = performance.now();
    for (const c of cases) analyzeCase(c, ruleSet);
    times.push((performance.now() - t0) / 1000);
  }
  times.sort((a, b) => a - b);
  const mean = times.reduce((s, x) => s + x, 0) / times.length;
  return { best: times[0], median: times[times.length >> 1], mean, passes: times.length };
}

const mega = (x: number) => `${(x / 1e6).toFixed(1)} M`;

function throughput(): void {
  const cases = Array.from({ length: 100 }, (_, i) => syntheticCase(1000 + i));
  const samples = cases.reduce((s, c) => s + sampleCount(c), 0);
  const r = timePasses(cases, PLATEAU_DEFAULT_V1, 3000);
  const episodes = cases.reduce((s, c) => s + analyzeCase(c, PLATEAU_DEFAULT_V1).episodes.length, 0);
  console.log(`Throughput, plateau-default v1 (${PLATEAU_DEFAULT_V1.rules.length} rules), ${cases.length} synthetic one-hour cases, 1 Hz EtCO2 + RR + SpO2 (${(episodes / cases.length).toFixed(1)} episodes per case):`);
  console.log(`  best pass: ${mega(samples / r.best)} samples/s (${((r.best / cases.length) * 1000).toFixed(3)} ms per one-hour case)`);
  console.log(`  median of ${r.passes} passes: ${mega(samples / r.median)} samples/s (${((r.median / cases.length) * 1000).toFixed(3)} ms per case); mean ${mega(samples / r.mean)} samples/s`);
}

function peakRss(): void {
  const before = process.memoryUsage().rss;
  let sampled = before;
  let episodes = 0;
  const t0 = performance.now();
  for (let i = 0; i < 1000; i++) {
    const c = syntheticCase(50_000 + i);
    episodes += analyzeCase(c, PLATEAU_DEFAULT_V1).episodes.length;
    if (i % 25 === 0) sampled = Math.max(sampled, process.memoryUsage().rss);
  }
  const seconds = (performance.now() - t0) / 1000;
  const maxRssMb = process.resourceUsage().maxRSS / 1024;
  console.log(`Memory, 1,000 one-hour cases generated and analysed in turn (${episodes} episodes, ${seconds.toFixed(2)} s including generation):`);
  console.log(`  RSS before ${(before / 2 ** 20).toFixed(0)} MB, highest sampled ${(sampled / 2 ** 20).toFixed(0)} MB, peak (maxRSS) ${maxRssMb.toFixed(0)} MB (target < 200 MB)`);
}

function toCsv(c: CaseRecord): string {
  const [et, rr, sp] = ['etco2', 'rr', 'spo2'].map((ch) => c.series.find((s) => s.channel === ch)!);
  const lines = ['t,etco2,rr,spo2'];
  for (let i = 0; i < et.t.length; i++) lines.push(`${et.t[i]},${et.v[i]},${rr.v[i]},${sp.v[i]}`);
  return `${lines.join('\n')}\n`;
}

interface PythonResult {
  impl: string;
  cases: number;
  samples: number;
  seconds: number;
  episodes: Record<string, [number, number]>;
}

function runPython(script: string, dir: string, rounds: number): PythonResult | string {
  const r = spawnSync(PYTHON, [path.join(HERE, script), dir, String(rounds)], { encoding: 'utf8', maxBuffer: 1 << 24 });
  if (r.error) return `could not run ${PYTHON} (${r.error.message})`;
  if (r.status !== 0) return `${script} failed: ${r.stderr.trim().split('\n').slice(-1)[0]}`;
  return JSON.parse(r.stdout) as PythonResult;
}

function pythonComparison(): void {
  const n = 100;
  const cases = Array.from({ length: n }, (_, i) => syntheticCase(7000 + i));
  const dir = mkdtempSync(path.join(os.tmpdir(), 'plateau-bench-'));
  try {
    cases.forEach((c, i) => writeFileSync(path.join(dir, `case-${String(i).padStart(4, '0')}.csv`), toCsv(c)));
    const samples = cases.reduce((s, c) => s + sampleCount(c), 0);
    const ours = timePasses(cases, FIVE_ABSOLUTE_RULES, 2000);
    const oursRate = samples / ours.best;
    const counts: Record<string, [number, number]> = Object.fromEntries(FIVE_RULE_IDS.map((id) => [id, [0, 0]]));
    for (const c of cases) {
      for (const e of analyzeCase(c, FIVE_ABSOLUTE_RULES).episodes) {
        counts[e.rule][0] += 1;
        counts[e.rule][1] += e.durationS;
      }
    }
    console.log(`Five absolute rules (${FIVE_RULE_IDS.join(', ')}) on ${n} one-hour cases, detection time, best of several runs:`);
    console.log(`  Plateau (TypeScript, whole analyzeCase): ${mega(oursRate)} samples/s (${((ours.best / n) * 1000).toFixed(3)} ms per case)`);
    for (const [script, rounds] of [
      ['rules_numpy.py', 5],
      ['rules_pandas.py', 2],
    ] as const) {
      const r = runPython(script, dir, rounds);
      if (typeof r === 'string') {
        console.log(`  ${script}: skipped — ${r}`);
        continue;
      }
      const rate = r.samples / r.seconds;
      const agree = FIVE_RULE_IDS.every((id) => r.episodes[id][0] === counts[id][0] && Math.abs(r.episodes[id][1] - counts[id][1]) < 1e-6);
      console.log(
        `  ${r.impl} (${PYTHON}): ${mega(rate)} samples/s (${((r.seconds / r.cases) * 1000).toFixed(3)} ms per case); Plateau is ${(oursRate / rate).toFixed(1)}× faster; episodes ${agree ? 'agree' : `DIFFER: ${JSON.stringify(r.episodes)} vs ${JSON.stringify(counts)}`}`,
      );
    }
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

/** Run the rules benchmarks and print the figures. */
export async function main(): Promise<void> {
  console.log(`# Rules engine benchmark (Node ${process.version}, ${os.cpus().length} CPUs: ${os.cpus()[0]?.model ?? 'unknown'}, load average ${os.loadavg()[0].toFixed(1)})`);
  peakRss(); // first, so the peak is this phase's own
  throughput();
  pythonComparison();
}

if (process.argv[1] !== undefined && /tests[\\/]bench[\\/]rules\.ts$/.test(process.argv[1])) {
  void main();
}
