/**
 * Seeded synthetic cases for the benchmarks: 1 Hz EtCO2, RR and SpO2 monitor series with a few
 * apneas (EtCO2 and RR to 0, SpO2 dipping after), a slow hypoventilation and noise. Benchmark
 * data only; the demo generator lives in lib/demo.
 */
import type { CaseRecord, DoseEntry, InterventionEntry } from '../../lib/domain/caseRecord';

/** mulberry32: a small, fast, seeded PRNG returning [0, 1). */
export function mulberry32(seed: number): () => number {
  let a = seed >>> 0;
  return () => {
    a = (a + 0x6d2b79f5) >>> 0;
    let t = a;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
}

export interface SyntheticOptions {
  /** Case length in seconds (default 3600). */
  durationS?: number;
}

/** One synthetic case; the same seed always gives the same case. */
export function syntheticCase(seed: number, options: SyntheticOptions = {}): CaseRecord {
  const rnd = mulberry32(seed);
  const n = options.durationS ?? 3600;
  // packed arrays filled by push, as JSON.parse makes them
  const t: number[] = [];
  const etco2: number[] = [];
  const rr: number[] = [];
  const spo2: number[] = [];
  const baseEt = 34 + Math.floor(rnd() * 8);
  const baseRr = 12 + Math.floor(rnd() * 5);
  const baseSp = 96 + Math.floor(rnd() * 4);

  // events: apneas of 10–80 s, one hypoventilation stretch
  const apneas: [number, number][] = [];
  const count = Math.floor(rnd() * 5);
  for (let k = 0; k < count; k++) {
    const s = 300 + Math.floor(rnd() * (n - 500));
    apneas.push([s, s + 10 + Math.floor(rnd() * 70)]);
  }
  const hypoStart = 600 + Math.floor(rnd() * (n - 900));
  const hypoLen = Math.floor(rnd() * 240);

  let desat = 0;
  for (let i = 0; i < n; i++) {
    t.push(i);
    let inApnea = false;
    for (const [s, e] of apneas) if (i >= s && i < e) inApnea = true;
    const hypo = i >= hypoStart && i < hypoStart + hypoLen ? 14 * Math.sin((Math.PI * (i - hypoStart)) / Math.max(hypoLen, 1)) : 0;
    if (inApnea) {
      etco2.push(0);
      rr.push(0);
      desat = Math.min(desat + 0.4, 25);
    } else {
      etco2.push(Math.max(0, Math.round(baseEt + hypo + (rnd() - 0.5) * 4)));
      rr.push(Math.max(0, Math.round(baseRr - hypo / 3 + (rnd() - 0.5) * 3)));
      desat = Math.max(desat - 0.5, 0);
    }
    spo2.push(Math.min(100, Math.max(1, Math.round(baseSp - desat + (rnd() - 0.5) * 2))));
  }

  const doses: DoseEntry[] = [{ t: 180, drug: 'propofol', amount: 50, unit: 'mg', route: 'IV' }];
  for (let k = 1; k < 6; k++) doses.push({ t: 180 + k * 500 + Math.floor(rnd() * 100), drug: 'propofol', amount: 20, unit: 'mg', route: 'IV' });
  const interventions: InterventionEntry[] = apneas.filter(() => rnd() < 0.6).map(([s]) => ({ t: s + 5 + Math.floor(rnd() * 20), kind: 'jaw_thrust' }));

  return {
    case: { start: '2026-03-02T09:00:00Z', etco2Unit: 'mmHg' },
    series: [
      { channel: 'etco2', unit: 'mmHg', source: 'monitor', t, v: etco2 },
      { channel: 'rr', unit: '/min', source: 'monitor', t: t.slice(), v: rr },
      { channel: 'spo2', unit: '%', source: 'monitor', t: t.slice(), v: spo2 },
    ],
    doses,
    interventions,
    events: [
      { t: 170, kind: 'sedation_start' },
      { t: n - 120, kind: 'sedation_end' },
    ],
  };
}

/** Monitor samples in a case (the benchmark's unit of work). */
export function sampleCount(record: CaseRecord): number {
  return record.series.reduce((s, x) => s + x.t.length, 0);
}
