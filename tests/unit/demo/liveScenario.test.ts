import { describe, expect, it } from 'vitest';
import { CHANNEL_SPECS } from '@/lib/domain/channel';
import { LIVE_SCENARIOS, createRng, liveScenarioStream, type LiveSample } from '@/lib/demo';
import { runs } from './_helpers';

const take = (seed: number, scenario: (typeof LIVE_SCENARIOS)[number], n: number, startT = 0) => [...liveScenarioStream(createRng(seed), scenario, startT, { durationS: n })];
const col = (xs: LiveSample[], k: keyof LiveSample) => xs.map((x) => x[k]);

describe('the live monitor simulator', () => {
  it('yields one sample a second from the start time, lazily and without end', () => {
    const xs = take(1, 'calm', 5, 1000);
    expect(xs.map((x) => x.t)).toEqual([1000, 1001, 1002, 1003, 1004]);
    const it = liveScenarioStream(createRng(1), 'apnea', 0);
    for (let i = 0; i < 5000; i++) expect(it.next().done).toBe(false);
  });

  it('is deterministic for a seed', () => {
    expect(take(4, 'hypoxemia', 400)).toEqual(take(4, 'hypoxemia', 400));
    expect(take(4, 'hypoxemia', 400)).not.toEqual(take(5, 'hypoxemia', 400));
  });

  it('keeps every value in the accepted ranges', () => {
    for (const scenario of LIVE_SCENARIOS) {
      for (const x of take(2, scenario, 1200)) {
        for (const ch of ['etco2', 'rr', 'spo2', 'hr'] as const) {
          expect(x[ch]).toBeGreaterThanOrEqual(CHANNEL_SPECS[ch].min);
          expect(x[ch]).toBeLessThanOrEqual(CHANNEL_SPECS[ch].max);
        }
      }
    }
  });

  it('stays calm in "calm": no apnea, no desaturation, normal EtCO2 and RR', () => {
    const xs = take(3, 'calm', 1800);
    expect(Math.min(...col(xs, 'etco2'))).toBeGreaterThanOrEqual(28);
    expect(Math.max(...col(xs, 'etco2'))).toBeLessThanOrEqual(47);
    expect(Math.min(...col(xs, 'rr'))).toBeGreaterThanOrEqual(9);
    expect(Math.min(...col(xs, 'spo2'))).toBeGreaterThanOrEqual(94);
  });

  it('in "apnea", breaks calm breathing with 25–45 s apneas that recover, SpO2 staying up', () => {
    const xs = take(6, 'apnea', 1200);
    const t = col(xs, 't');
    const apneas = runs(t, col(xs, 'etco2'), (v) => v < 5);
    expect(apneas.length).toBeGreaterThanOrEqual(5);
    for (const [start, dur] of apneas.slice(0, -1)) {
      expect(dur).toBeGreaterThanOrEqual(25);
      expect(dur).toBeLessThanOrEqual(45);
      expect(xs[start].rr).toBe(0);
    }
    expect(Math.min(...col(xs, 'spo2'))).toBeGreaterThanOrEqual(94);
  });

  it('in "hypoxemia", drops SpO2 below 90 % for 30–50 s, 35–50 s after each apnea begins', () => {
    const xs = take(8, 'hypoxemia', 1500);
    const t = col(xs, 't');
    const apneas = runs(t, col(xs, 'etco2'), (v) => v < 5);
    const desats = runs(t, col(xs, 'spo2'), (v) => v < 90);
    expect(desats.length).toBeGreaterThanOrEqual(5);
    for (const [start, dur] of desats.slice(0, -1)) {
      const a = apneas.filter(([s]) => s < start).pop()!;
      expect(start - a[0]).toBeGreaterThanOrEqual(35);
      expect(start - a[0]).toBeLessThanOrEqual(50);
      expect(dur).toBeGreaterThanOrEqual(30);
      expect(dur).toBeLessThanOrEqual(50);
      const nadir = Math.min(...xs.slice(start, start + dur).map((x) => x.spo2));
      expect(nadir).toBeGreaterThanOrEqual(80);
      expect(nadir).toBeLessThanOrEqual(86);
    }
  });
});
