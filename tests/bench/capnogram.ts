/**
 * Capnogram benchmark (prints figures; not a test). Run alone with `npx tsx tests/bench/capnogram.ts`
 * or with the others through `npm run bench`.
 *
 * One hour of synthetic capnogram at 100 Hz (360,000 samples, realistic noise, drift and
 * cardiogenic ripples) analysed by `analyzeCapnogram` — segmentation, per-breath measurements,
 * shape findings and derived trends — timed over repeated passes (best and median wall time, and
 * CPU time, since this machine may be shared). Memory: the heap one result keeps (breaths,
 * findings, trends) for 1, 2, 4 and 8 hours, which should follow the breaths (≈ 840 an hour).
 * The analysis itself allocates no per-sample arrays (fixed windows and one breath of scratch).
 */
import v8 from 'node:v8';
import vm from 'node:vm';
import { analyzeCapnogram, generateCapnogram } from '../../lib/capnogram';

function hour(hours: number) {
  return generateCapnogram({
    rateHz: 100,
    stretches: [{ durationS: 3600 * hours }],
    noiseSd: 0.5,
    drift: { amp: 2, periodS: 120 },
    cardiogenic: { amp: 3, hrPerMin: 80 },
    jitter: { period: 0.08, etco2: 1 },
    seed: 42,
  }).segment;
}

/** A full garbage collection, also when node was started without --expose-gc. */
function gc(): void {
  const g = (globalThis as { gc?: () => void }).gc ?? (v8.setFlagsFromString('--expose-gc'), vm.runInNewContext('gc') as () => void);
  g();
  g();
}

/** Heap kept by the result of one analysis of `hours` of waveform (bytes), and its breaths. */
function kept(hours: number): { bytes: number; breaths: number } {
  const seg = hour(hours);
  const keep: unknown[] = [];
  gc();
  const before = process.memoryUsage().heapUsed;
  const r = analyzeCapnogram([seg]);
  keep.push(r);
  gc();
  const bytes = process.memoryUsage().heapUsed - before;
  return { bytes, breaths: r.breaths.length };
}

export async function main(): Promise<void> {
  const seg = hour(1);
  for (let i = 0; i < 5; i++) analyzeCapnogram([seg]); // warm up the JIT
  const wall: number[] = [];
  const cpu: number[] = [];
  let breaths = 0;
  for (let i = 0; i < 25; i++) {
    const c0 = process.cpuUsage();
    const t0 = performance.now();
    breaths = analyzeCapnogram([seg]).breaths.length;
    wall.push(performance.now() - t0);
    const c = process.cpuUsage(c0);
    cpu.push((c.user + c.system) / 1000);
  }
  wall.sort((a, b) => a - b);
  cpu.sort((a, b) => a - b);
  console.log(`capnogram: 1 h at 100 Hz (${seg.v.length.toLocaleString('en')} samples, ${breaths} breaths)`);
  console.log(`  analyzeCapnogram wall: best ${wall[0].toFixed(1)} ms, median ${wall[wall.length >> 1].toFixed(1)} ms; CPU median ${cpu[cpu.length >> 1].toFixed(1)} ms (target ≤ 50 ms)`);
  const input = seg.v.length * 4;
  const mem = [1, 2, 4, 8].map((h) => ({ h, ...kept(h) }));
  console.log(`  heap kept by one result (after GC): ${mem.map((m) => `${m.h} h ${(m.bytes / 1024).toFixed(0)} KiB (${(m.bytes / m.breaths).toFixed(0)} B/breath)`).join(', ')}; the input itself is ${(input / 1024).toFixed(0)} KiB per hour`);
  console.log(`  rss ${(process.memoryUsage().rss / 1048576).toFixed(0)} MiB`);
}

if (process.argv[1] !== undefined && /tests[\\/]bench[\\/]capnogram\.ts$/.test(process.argv[1])) {
  void main();
}
