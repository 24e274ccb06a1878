import { describe, expect, it } from 'vitest';
import { analyzeCapnogram, generateCapnogram, type GenerateCapnogramOptions } from '@/lib/capnogram';
import { matchBreaths } from './helpers';

/** "Realistic" noise: sidestream capnometers show well under 1 mmHg of noise (Plateau's reading). */
const REALISTIC: Partial<GenerateCapnogramOptions> = { noiseSd: 0.5, drift: { amp: 2, periodS: 120 }, cardiogenic: { amp: 3, hrPerMin: 80 }, jitter: { period: 0.08, etco2: 1 } };

function run(opts: Partial<GenerateCapnogramOptions> & { stretches?: GenerateCapnogramOptions['stretches'] }, seed = 1) {
  const g = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 600 }], seed, ...opts });
  const r = analyzeCapnogram([g.segment]);
  return { ...g, r, m: matchBreaths(r.breaths, g.truth) };
}

describe('breath segmentation on synthetic capnograms', () => {
  it('finds every breath of a clean 10-minute recording at 14 /min', () => {
    const { m, truth } = run({});
    expect(truth.length).toBe(140);
    expect(m.f1).toBe(1);
  });

  for (const seed of [1, 2, 3, 4, 5, 6]) {
    it(`recovers the breaths with F1 ≥ 0.98 at realistic noise, drift and cardiogenic ripples (seed ${seed})`, () => {
      const { m } = run(REALISTIC, seed);
      expect(m.f1).toBeGreaterThanOrEqual(0.98);
    });
  }

  it('measures each breath’s EtCO2 within 1 mmHg and its rate within 1 /min at realistic noise', () => {
    const { m, truth } = run(REALISTIC, 7);
    expect(m.pairs.length).toBeGreaterThan(130);
    for (const [b, t] of m.pairs) expect(Math.abs(b.etco2 - t.etco2)).toBeLessThanOrEqual(1);
    // The true instantaneous rate of a breath is 60 / its cycle; compare where both are known.
    for (const [b, t] of m.pairs) if (b.rrPerMin !== null && t !== truth[truth.length - 1]) expect(Math.abs(b.rrPerMin - t.rrPerMin)).toBeLessThanOrEqual(1);
  });

  it('keeps the mean EtCO2 error under 1 mmHg even at 1 mmHg noise', () => {
    const { m } = run({ ...REALISTIC, noiseSd: 1 }, 8);
    expect(m.f1).toBeGreaterThanOrEqual(0.98);
    const err = m.pairs.map(([b, t]) => Math.abs(b.etco2 - t.etco2));
    expect(err.reduce((s, x) => s + x, 0) / err.length).toBeLessThan(1);
  });

  it.each([
    ['slow', 6],
    ['normal', 14],
    ['fast', 30],
    ['child', 45],
  ])('tracks a %s rate (%i /min) within 1 /min', (_name, rr) => {
    const { m } = run({ ...REALISTIC, stretches: [{ durationS: 300, rrPerMin: rr }] }, 9);
    expect(m.f1).toBeGreaterThanOrEqual(0.98);
    const rates = m.pairs.map(([b]) => b.rrPerMin).filter((x): x is number => x !== null);
    const mean = rates.reduce((s, x) => s + x, 0) / rates.length;
    expect(Math.abs(mean - rr)).toBeLessThan(1);
  });

  it('finds small breaths (8 mmHg) after normal ones', () => {
    const { m } = run({ noiseSd: 0.3, stretches: [{ durationS: 120 }, { durationS: 240, etco2: 8, plateauSlope: 0.3 }] }, 10);
    expect(m.recall).toBeGreaterThanOrEqual(0.95);
    expect(m.precision).toBeGreaterThanOrEqual(0.98);
  });

  it('measures an upstroke of 0.12 s and a plateau slope of 1.5 mmHg/s on clean breaths', () => {
    const { r } = run({ stretches: [{ durationS: 60 }] });
    const b = r.breaths[3];
    expect(b.riseTimeS).toBeGreaterThan(0.1);
    expect(b.riseTimeS).toBeLessThan(0.17);
    expect(b.plateauSlope).toBeCloseTo(1.5, 1);
    expect(b.alphaDeg).toBeGreaterThan(95);
    expect(b.alphaDeg).toBeLessThan(110);
    expect(b.inspMin).toBeCloseTo(0, 1);
    expect(b.expTimeS).toBeCloseTo((60 / 14) * 0.5, 1);
  });

  it('does not take cardiogenic ripples during a flat pause for breaths', () => {
    const { r } = run({ noiseSd: 0.3, cardiogenic: { amp: 3, hrPerMin: 70 }, stretches: [{ durationS: 60 }, { durationS: 40, rrPerMin: 1 }, { durationS: 60 }] }, 11);
    const inPause = r.breaths.filter((b) => b.expStartS > 62 && b.expStartS < 99);
    expect(inPause.length).toBeLessThanOrEqual(1); // the single breath at 60 s may fall in
  });

  it('works at 20 Hz and at 300 Hz', () => {
    for (const rateHz of [20, 300]) {
      const g = generateCapnogram({ rateHz, stretches: [{ durationS: 300 }], ...REALISTIC, seed: 12 });
      const m = matchBreaths(analyzeCapnogram([g.segment]).breaths, g.truth);
      expect(m.f1).toBeGreaterThanOrEqual(0.98);
    }
  });
});
