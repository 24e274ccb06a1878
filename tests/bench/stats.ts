/**
 * Benchmark for lib/stats: how long the review pages' statistics take for 100,000 cases'
 * worth of data. Prints figures; not a test. Run: npx tsx tests/bench/stats.ts
 */
import { performance } from 'node:perf_hooks';
import { mulberry32 as random } from './syntheticCase';
import {
  clopperPearsonInterval,
  funnelLimits,
  funnelPlot,
  pChart,
  specialCauses,
  wilsonCcInterval,
  wilsonInterval,
} from '@/lib/stats';

const TOTAL_CASES = 100_000;


/** Split TOTAL_CASES into `groups` groups with events at rate `p`. */
function groups(count: number, p: number, seed: number): { label: string; x: number; n: number }[] {
  const rnd = random(seed);
  const base = Math.floor(TOTAL_CASES / count);
  return Array.from({ length: count }, (_, i) => {
    const n = i === count - 1 ? TOTAL_CASES - base * (count - 1) : base;
    let x = 0;
    for (let j = 0; j < n; j++) if (rnd() < p) x++;
    return { label: `G${i + 1}`, x, n };
  });
}

function time(label: string, repeat: number, f: () => unknown): void {
  f(); // warm up
  const start = performance.now();
  for (let i = 0; i < repeat; i++) f();
  const ms = (performance.now() - start) / repeat;
  console.log(`${label.padEnd(64)} ${ms.toFixed(3).padStart(10)} ms`);
}

export async function main(): Promise<void> {
  console.log(`lib/stats benchmark, ${TOTAL_CASES.toLocaleString('en')} cases (mean of repeats, after one warm-up)`);

  const cells = groups(10_000, 0.04, 1); // e.g. 20 units × 500 weeks, 10 cases a cell
  time('wilsonInterval × 10,000 cells of 10 cases', 20, () => cells.map((c) => wilsonInterval(c.x, c.n)));
  time('wilsonCcInterval × 10,000 cells of 10 cases', 20, () => cells.map((c) => wilsonCcInterval(c.x, c.n)));
  time('clopperPearsonInterval × 10,000 cells of 10 cases', 5, () => cells.map((c) => clopperPearsonInterval(c.x, c.n)));
  const units = groups(100, 0.04, 2);
  time('clopperPearsonInterval × 100 units of 1,000 cases', 20, () => units.map((c) => clopperPearsonInterval(c.x, c.n)));

  const months = groups(1_000, 0.04, 3);
  time('pChart, 1,000 points of 100 cases', 50, () => pChart(months));
  time('pChart revise + specialCauses, 1,000 points of 100 cases', 50, () => specialCauses(pChart(months, { revise: true })));
  const weeks = groups(36, 0.04, 4);
  time('pChart revise + specialCauses, 36 points of ~2,778 cases', 200, () => specialCauses(pChart(weeks, { revise: true })));

  const sites = groups(200, 0.04, 5);
  time('funnelPlot exact, 200 units of 500 cases, 100 curve points', 5, () => funnelPlot(sites));
  time('funnelPlot normal, 200 units of 500 cases, 100 curve points', 20, () => funnelPlot(sites, undefined, { method: 'normal' }));
  const few = groups(20, 0.04, 6);
  time('funnelPlot exact, 20 units of 5,000 cases, 100 curve points', 5, () => funnelPlot(few));
  time('funnelLimits exact, one unit of 100,000 cases', 20, () => funnelLimits(0.04, TOTAL_CASES));
}

// Run when executed directly (a runner may also import main()).
if (process.argv[1] && /tests[\\/]bench[\\/]stats\.ts$/.test(process.argv[1])) {
  void main();
}
