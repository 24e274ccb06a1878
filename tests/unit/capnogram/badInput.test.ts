import { describe, expect, it } from 'vitest';
import { analyzeCapnogram, breathTrends, generateCapnogram, parseWaveformCsv, WaveformError } from '@/lib/capnogram';
import { analyzeCase, getBuiltInRuleSet } from '@/lib/rules';
import type { CaseRecord } from '@/lib/domain/caseRecord';

const csv = (rows: string[], header = 'time,co2') => [header, ...rows].join('\n');

describe('reading a raw CO2 CSV', () => {
  it('reads time + value, converting kPa to mmHg (1 kPa = 7.50062 mmHg, references.md Units)', () => {
    const p = parseWaveformCsv(csv(['10.00,0', '10.01,5.333', '10.02,4']), { rateHz: 100, unit: 'kPa' });
    expect(p.layout).toBe('time');
    expect(p.fileT0S).toBe(10);
    expect(p.v[1]).toBeCloseTo(40.0, 1);
  });

  it('reads sample index + value and a single column of values', () => {
    expect(parseWaveformCsv(csv(['0,1', '1,2', '2,3'], 'sample,co2'), { rateHz: 50, unit: 'mmHg' }).layout).toBe('index');
    const one = parseWaveformCsv('1\n2\n3\n', { rateHz: 50, unit: 'mmHg' });
    expect(one.layout).toBe('values');
    expect(Array.from(one.v)).toEqual([1, 2, 3]);
  });

  it('refuses a stated rate outside 20–300 Hz, naming the field', () => {
    for (const rateHz of [10, 301, NaN]) {
      expect(() => parseWaveformCsv(csv(['0,1', '0.01,2']), { rateHz, unit: 'mmHg' })).toThrow(WaveformError);
    }
    try {
      parseWaveformCsv(csv(['0,1', '0.01,2']), { rateHz: 10, unit: 'mmHg' });
    } catch (e) {
      expect((e as WaveformError).field).toBe('rateHz');
    }
  });

  it('refuses times that disagree with the stated rate', () => {
    const rows = Array.from({ length: 50 }, (_, i) => `${(i * 0.02).toFixed(2)},30`);
    expect(() => parseWaveformCsv(csv(rows), { rateHz: 100, unit: 'mmHg' })).toThrow(/stated 100 Hz, but the times step 0.02 s \(50 Hz\)/);
  });

  it('marks non-numeric and absurd values and time jumps as gaps (NaN), and refuses a file of mostly junk', () => {
    const rows = Array.from({ length: 100 }, (_, i) => `${(i * 0.01).toFixed(2)},${i === 5 ? 'abc' : i === 6 ? '900' : '30'}`);
    rows.splice(50, 10); // 0.10 s missing
    const p = parseWaveformCsv(csv(rows), { rateHz: 100, unit: 'mmHg' });
    expect(p.badValues).toBe(2);
    expect(Number.isNaN(p.v[5])).toBe(true);
    expect(Number.isNaN(p.v[6])).toBe(true);
    expect(p.gapSamples).toBe(10);
    expect(Number.isNaN(p.v[55])).toBe(true);
    const junk = Array.from({ length: 20 }, (_, i) => `${(i * 0.01).toFixed(2)},${i % 2 ? 'x' : '3'}`);
    expect(() => parseWaveformCsv(csv(junk), { rateHz: 100, unit: 'mmHg' })).toThrow(/10 of 20 values are not numbers/);
  });

  it('refuses times running backwards, an empty file and three columns', () => {
    expect(() => parseWaveformCsv(csv(['0,1', '0.01,2', '0.005,3']), { rateHz: 100, unit: 'mmHg' })).toThrow(/does not increase/);
    expect(() => parseWaveformCsv('  \n', { rateHz: 100, unit: 'mmHg' })).toThrow(/empty/);
    expect(() => parseWaveformCsv('a,b,c\n1,2,3\n', { rateHz: 100, unit: 'mmHg' })).toThrow(/one column/);
  });
});

describe('analysing bad signals never crashes', () => {
  it('refuses a rate outside 20–300 Hz with a RangeError', () => {
    expect(() => analyzeCapnogram([{ t0S: 0, rateHz: 5, v: new Float32Array(100) }])).toThrow(RangeError);
  });

  it('treats NaN, infinite and absurd samples as gaps and keeps the breaths around them', () => {
    const { segment, truth } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 120 }], noiseSd: 0.3, seed: 4 });
    const v = segment.v as Float32Array;
    v.fill(NaN, 3000, 4000); // 30–40 s missing
    v[7000] = Infinity;
    v[7001] = 1e6;
    v[7002] = -50;
    const r = analyzeCapnogram([segment]);
    expect(r.gaps.some((g) => g.startS === 30 && g.endS === 40)).toBe(true);
    expect(r.gaps.some((g) => Math.abs(g.startS - 70) < 1e-9)).toBe(true);
    expect(r.breaths.length).toBeGreaterThanOrEqual(truth.length - 5);
    expect(r.findings.filter((f) => f.kind === 'sudden_zero')).toEqual([]);
  });

  it('returns no breaths (and no crash) for empty, constant, all-NaN and pure-noise signals', () => {
    const noise = new Float32Array(6000).map((_, i) => Math.sin(i * 12.9898) * 0.8);
    for (const v of [new Float32Array(0), new Float32Array(6000).fill(35), new Float32Array(6000).fill(NaN), noise, [1, 2, 3]]) {
      const r = analyzeCapnogram([{ t0S: 0, rateHz: 100, v }]);
      expect(r.breaths).toEqual([]);
    }
  });

  it('lists the time between two segments as a gap', () => {
    const a = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 30 }], seed: 1 }).segment;
    const b = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 30 }], seed: 2, t0S: 100 }).segment;
    const r = analyzeCapnogram([b, a]);
    expect(r.gaps).toContainEqual({ startS: 30, endS: 100 });
    expect(r.breaths.every((x, i, all) => i === 0 || x.expStartS > all[i - 1].expStartS)).toBe(true);
  });
});

describe('derived trends feed the rules engine', () => {
  it('gives per-breath EtCO2, inspired CO2 and RR monitor series, and an apnea during a flat line', () => {
    const { segment } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 120 }, { durationS: 40, flat: true }, { durationS: 120 }], noiseSd: 0.3, seed: 6 });
    const r = analyzeCapnogram([segment]);
    expect(r.series.map((s) => [s.channel, s.source, s.unit])).toEqual([
      ['etco2', 'monitor', 'mmHg'],
      ['inspco2', 'monitor', 'mmHg'],
      ['rr', 'monitor', '/min'],
    ]);
    for (const s of r.series) expect(s.t.every((t, i) => i === 0 || t > s.t[i - 1])).toBe(true);
    const record: CaseRecord = { case: { start: '2026-01-01T08:00:00Z', etco2Unit: 'mmHg' }, series: r.series, doses: [], interventions: [], events: [] };
    const analysis = analyzeCase(record, getBuiltInRuleSet('plateau-default')!);
    const apnea = analysis.episodes.filter((e) => e.rule === 'apnea');
    expect(apnea.length).toBe(1);
    expect(apnea[0].start).toBeGreaterThan(115);
    expect(apnea[0].start).toBeLessThan(135);
    expect(r.findings.map((f) => f.kind)).toContain('sudden_zero');
  });

  it('makes no series from no breaths', () => {
    expect(breathTrends([], [])).toEqual([]);
  });
});
