import { describe, expect, it } from 'vitest';
import { analyzeCapnogram, FINDING_DEFAULTS, generateCapnogram, shapeFindings, type Breath, type Pause } from '@/lib/capnogram';

/** A normal measured breath every 4 s; fields overridden per test. */
function breath(i: number, over: Partial<Breath> = {}): Breath {
  return {
    expStartS: i * 4, expEndS: i * 4 + 2, etco2: 38, peak: 38, inspMin: 0, baseline: 0, expTimeS: 2, inspTimeS: 2, rrPerMin: 15,
    riseTimeS: 0.12, upSlope: 250, plateauSlope: 1.5, alphaDeg: 102, notchDepth: 0, stretch: 0, ...over,
  };
}
const breaths = (n: number, over: (i: number) => Partial<Breath>) => Array.from({ length: n }, (_, i) => breath(i, over(i)));
const kinds = (bs: Breath[], pauses: Pause[] = [], ref?: number) => shapeFindings(bs, pauses, ref === undefined ? {} : { referenceAmplitude: ref }).findings.map((f) => f.kind);

describe('shape findings at and just past their thresholds', () => {
  it('reports nothing for normal breaths', () => {
    expect(kinds(breaths(20, () => ({})))).toEqual([]);
  });

  it('rebreathing: inspired CO2 ≥ 3 mmHg on 5 consecutive breaths, not 4, not 2.9 mmHg', () => {
    expect(FINDING_DEFAULTS.rebreathingMmHg).toBe(3);
    expect(FINDING_DEFAULTS.rebreathingBreaths).toBe(5);
    const at = (v: number, n: number) => kinds(breaths(10, (i) => (i >= 2 && i < 2 + n ? { inspMin: v } : {})));
    expect(at(3, 5)).toEqual(['rebreathing']);
    expect(at(3, 4)).toEqual([]);
    expect(at(2.9, 8)).toEqual([]);
    const f = shapeFindings(breaths(10, (i) => (i >= 2 && i < 7 ? { inspMin: 3 } : {})), []).findings[0];
    expect(f.breaths).toEqual([2, 3, 4, 5, 6]);
    expect(f.startS).toBe(8);
    expect(f.endS).toBe(28);
    expect(f.confidence).toBe(0.5);
    expect(f.description).toMatch(/rebreathing/);
  });

  it('obstructive upstroke: angle ≥ 120° on 3 consecutive breaths', () => {
    const at = (deg: number, n: number) => kinds(breaths(10, (i) => (i < n ? { alphaDeg: deg } : {})));
    expect(at(120, 3)).toEqual(['obstructive_upstroke']);
    expect(at(119.9, 6)).toEqual([]);
    expect(at(130, 2)).toEqual([]);
  });

  it('lost plateau: a fall of ≥ 20 % of the peak amplitude on 3 consecutive breaths', () => {
    const at = (fall: number, n: number) => kinds(breaths(10, (i) => (i < n ? { peak: 40, etco2: 40 - fall * 40 } : {})));
    expect(at(0.2, 3)).toEqual(['lost_plateau']);
    expect(at(0.19, 5)).toEqual([]);
    expect(at(0.4, 2)).toEqual([]);
  });

  it('plateau notch: depth ≥ 10 % of the amplitude and ≥ 2 mmHg, on a single breath', () => {
    expect(kinds(breaths(5, (i) => (i === 2 ? { notchDepth: 4, etco2: 40, peak: 40 } : {})))).toEqual(['plateau_notch']);
    expect(kinds(breaths(5, (i) => (i === 2 ? { notchDepth: 3.99, etco2: 40, peak: 40 } : {})))).toEqual([]);
    // 10 % of a 15 mmHg breath is 1.5 mmHg, under the 2 mmHg floor that keeps noise out
    expect(kinds(breaths(5, (i) => (i === 2 ? { notchDepth: 1.9, etco2: 15, peak: 15 } : {})), [], 38)).toEqual([]);
  });

  it('low-amplitude breathing: under 50 % of the reference amplitude on 3 consecutive breaths', () => {
    const at = (amp: number, n: number) => kinds(breaths(12, (i) => (i >= 4 && i < 4 + n ? { etco2: amp, peak: amp } : {})), [], 38);
    expect(at(18.9, 3)).toEqual(['low_amplitude']);
    expect(at(19, 6)).toEqual([]);
    expect(at(10, 2)).toEqual([]);
  });

  it('sudden zero: a flat line ≥ 10 s below 5 mmHg right after a normal breath', () => {
    const bs = breaths(5, () => ({}));
    const pause = (d: number, maxCo2 = 0.5, prevBreath = 4): Pause => ({ startS: 18, endS: 18 + d, maxCo2, prevBreath, stretch: 0 });
    expect(kinds(bs, [pause(10)])).toEqual(['sudden_zero']);
    expect(kinds(bs, [pause(9.99)])).toEqual([]);
    expect(kinds(bs, [pause(20, 5.1)])).toEqual([]);
    expect(kinds(bs, [pause(20, 0.5, -1)])).toEqual([]);
    // fading breaths before the pause are not "sudden"
    expect(kinds([...breaths(4, () => ({})), breath(4, { etco2: 12, peak: 12 })], [pause(20)], 38)).toEqual([]);
  });

  it('raises the confidence with margin and length', () => {
    const f = shapeFindings(breaths(12, () => ({ inspMin: 6 })), []).findings[0];
    expect(f.confidence).toBe(1);
    expect(f.measure).toEqual({ name: 'inspired CO2', value: 6, threshold: 3, unit: 'mmHg' });
  });
});

describe('shape findings from synthetic waveforms', () => {
  const NOISE = { noiseSd: 0.4, drift: { amp: 1, periodS: 120 }, jitter: { period: 0.05, etco2: 0.5 } };
  const run = (stretches: Parameters<typeof generateCapnogram>[0]['stretches'], seed = 3) =>
    analyzeCapnogram([generateCapnogram({ rateHz: 100, stretches, seed, ...NOISE }).segment]);
  const found = (r: ReturnType<typeof run>) => [...new Set(r.findings.map((f) => f.kind))];

  it('finds nothing in a normal recording', () => {
    expect(found(run([{ durationS: 300 }]))).toEqual([]);
  });

  it('finds rebreathing at an inspired baseline of 5 mmHg, not at 1.5 mmHg', () => {
    const r = run([{ durationS: 60 }, { durationS: 60, inspired: 5 }, { durationS: 60 }]);
    expect(found(r)).toEqual(['rebreathing']);
    const f = r.findings[0];
    expect(f.startS).toBeGreaterThan(55);
    expect(f.endS).toBeLessThan(130);
    expect(found(run([{ durationS: 60 }, { durationS: 60, inspired: 1.5 }, { durationS: 60 }]))).toEqual([]);
  });

  it('finds an obstructive upstroke in slow sloping breaths (rise 0.8 s, plateau 6 mmHg/s), not at 0.3 s', () => {
    expect(found(run([{ durationS: 60 }, { durationS: 60, riseTimeS: 0.8, plateauSlope: 6 }]))).toEqual(['obstructive_upstroke']);
    expect(found(run([{ durationS: 60 }, { durationS: 60, riseTimeS: 0.3, plateauSlope: 3 }]))).toEqual([]);
  });

  it('finds a lost plateau when it falls by 12 mmHg/s, not by 2 mmHg/s', () => {
    expect(found(run([{ durationS: 60 }, { durationS: 60, plateauSlope: -12, etco2: 25 }]))).toEqual(['lost_plateau']);
    expect(found(run([{ durationS: 60 }, { durationS: 60, plateauSlope: -2, etco2: 34 }]))).toEqual([]);
  });

  it('finds a plateau notch of 8 mmHg, not one of 2 mmHg', () => {
    const r = run([{ durationS: 30 }, { durationS: 10, notch: { depth: 8, at: 0.5, widthS: 0.3 } }, { durationS: 30 }]);
    expect(found(r)).toEqual(['plateau_notch']);
    expect(found(run([{ durationS: 30 }, { durationS: 10, notch: { depth: 2, at: 0.5, widthS: 0.3 } }, { durationS: 30 }]))).toEqual([]);
  });

  it('finds a sudden zero of 15 s, not of 8 s', () => {
    const r = run([{ durationS: 60 }, { durationS: 15, flat: true }, { durationS: 60 }]);
    expect(found(r)).toEqual(['sudden_zero']);
    expect(r.findings[0].durationS).toBeGreaterThanOrEqual(15);
    expect(r.findings[0].durationS).toBeLessThan(20);
    expect(found(run([{ durationS: 60 }, { durationS: 5, flat: true }, { durationS: 60 }]))).toEqual([]);
  });

  it('finds low-amplitude breathing at 14 mmHg after 38 mmHg, not at 25 mmHg', () => {
    expect(found(run([{ durationS: 120 }, { durationS: 60, etco2: 14, plateauSlope: 0.5 }]))).toEqual(['low_amplitude']);
    expect(found(run([{ durationS: 120 }, { durationS: 60, etco2: 25, plateauSlope: 1 }]))).toEqual([]);
  });
});
