import { describe, expect, it } from 'vitest';
import { analyzeCase, coverCase, coverEndAt, coverSeries, medianInterval, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { caseOf, manual, monitor, monitorAt, oneRule, runs } from './_build';

describe('coverage (rules.md §1)', () => {
  it('lets each monitor sample cover the time until the next one', () => {
    const tr = coverSeries(monitorAt('rr', [0, 1, 3, 6], [12, 12, 12, 12]));
    expect([0, 1, 2, 3].map((i) => coverEndAt(tr, i))).toEqual([1, 3, 6, 8]); // last: median interval 2 s
    expect(tr.covered).toEqual([0, 8]);
  });

  it('holds a sample for at most maxHold (30 s by default), leaving the rest of a gap unobserved', () => {
    const tr = coverSeries(monitorAt('rr', [0, 1, 100, 101], [12, 12, 12, 12]));
    expect(tr.covered).toEqual([0, 31, 100, 102]);
    expect(coverSeries(monitorAt('rr', [0, 1, 100, 101], [12, 12, 12, 12]), { maxHoldS: 10 }).covered).toEqual([0, 11, 100, 102]);
  });

  it('gives the last sample the median sampling interval, capped by maxHold', () => {
    expect(coverSeries(monitorAt('rr', [0, 5, 10, 15], [1, 1, 1, 1])).covered).toEqual([0, 20]);
    expect(coverSeries(monitorAt('rr', [0, 60, 120], [1, 1, 1])).covered).toEqual([0, 30, 60, 90, 120, 150]);
    expect(medianInterval([0, 1, 2, 4, 5])).toBe(1);
    expect(medianInterval([0, 1, 3, 6, 10])).toBe(2.5);
    expect(medianInterval([0, 2, 3, 7, 8, 18, 19])).toBe(1.5);
    expect(medianInterval([0, 2, 3, 7, 8, 18])).toBe(2);
  });

  it('gives a lone monitor sample no coverage: with one sample the sampling interval is unknown', () => {
    expect(coverSeries(monitorAt('spo2', [10], [80])).covered).toEqual([]);
  });

  it('treats an SpO2 of 0 or a probe-off sample as unobserved, not as hypoxemia', () => {
    const v = runs([97, 10], [0, 30], [70, 30], [97, 10]);
    const probeOff = v.map((_, i) => i >= 40 && i < 70);
    const rec = caseOf([monitor('spo2', v, { probeOff })]);
    const tr = coverCase(rec).spo2!;
    expect(tr.covered).toEqual([0, 10, 70, 80]);
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.episodes).toEqual([]);
    expect(a.summary.lowestSpo2).toEqual({ value: 97, t: 0 });
  });

  it('closes the episode before a probe-off stretch and censors it there', () => {
    const v = runs([97, 10], [80, 20], [80, 20]);
    const probeOff = v.map((_, i) => i >= 30);
    const a = analyzeCase(caseOf([monitor('spo2', v, { probeOff })]), oneRule({ id: 'low', terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }], combine: 'any', minDurationS: 0 }));
    expect(a.episodes.map((e) => [e.start, e.end, e.censoredAt])).toEqual([[10, 30, 'end']]);
  });

  it('never lets manual readings cover time', () => {
    const rec = caseOf([manual('spo2', [0, 300, 600], [80, 80, 80])]);
    expect(coverCase(rec).spo2).toBeUndefined();
    expect(analyzeCase(rec, PLATEAU_DEFAULT_V1).episodes).toEqual([]);
  });

  it('joins consecutive fractional samples exactly, so 0.1 s sampling makes one interval', () => {
    const t = Array.from({ length: 50 }, (_, i) => Math.round(i * 0.1 * 10) / 10);
    const tr = coverSeries(monitorAt('rr', t, t.map(() => 0)));
    expect(tr.covered.length).toBe(2);
    expect(tr.covered[0]).toBe(0);
    expect(tr.covered[1]).toBeCloseTo(5, 9);
  });
});
