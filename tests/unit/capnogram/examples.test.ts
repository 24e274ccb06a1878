import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analyzeCapnogram, downsampleMinMax, generateCapnogram, parseWaveformCsv, segmentBreaths, WaveformError } from '@/lib/capnogram';

describe('the documented examples', () => {
  it('generateCapnogram: 60 s at 100 Hz is 6,000 samples and 14 true breaths at 14 /min', () => {
    const { segment, truth } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 60 }], seed: 1 });
    expect(segment.v.length).toBe(6000);
    expect(truth.length).toBe(14);
    expect(segmentBreaths([segment]).breaths.length).toBe(14);
  });

  it('analyzeCapnogram: two minutes at 12 /min gives 24 breaths, no findings, an etco2 series first', () => {
    const { segment } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 120, rrPerMin: 12 }] });
    const r = analyzeCapnogram([segment]);
    expect(r.breaths.length).toBe(24);
    expect(r.findings).toEqual([]);
    expect(r.series[0].channel).toBe('etco2');
  });

  it('parseWaveformCsv and downsampleMinMax', () => {
    expect(Array.from(parseWaveformCsv('t,co2\n0,0\n0.01,1.5\n0.02,3', { rateHz: 100, unit: 'mmHg' }).v)).toEqual([0, 1.5, 3]);
    expect(downsampleMinMax([0, 5, 1, 4, 2, 3], 0, 1, 4)).toEqual({ t: [0, 1, 3, 4], v: [0, 5, 4, 2] });
  });
});

describe('never crashes', () => {
  it('analyses any values (NaN, ±Infinity, huge, negative) at any valid rate without throwing', () => {
    fc.assert(
      fc.property(fc.integer({ min: 20, max: 300 }), fc.array(fc.oneof(fc.double(), fc.double({ min: -5, max: 60, noNaN: true })), { maxLength: 3000 }), (rate, xs) => {
        const r = analyzeCapnogram([{ t0S: 0, rateHz: rate, v: Float32Array.from(xs) }]);
        for (const b of r.breaths) expect(Number.isFinite(b.etco2)).toBe(true);
        for (const s of r.series) expect(s.v.every((x) => Number.isFinite(x) && x >= 0 && x <= 150)).toBe(true);
      }),
      { numRuns: 200 },
    );
  });

  it('reads any text as a waveform or a WaveformError, nothing else', () => {
    fc.assert(
      fc.property(fc.string({ maxLength: 400 }), (text) => {
        try {
          parseWaveformCsv(text, { rateHz: 100, unit: 'mmHg' });
        } catch (e) {
          expect(e).toBeInstanceOf(WaveformError);
        }
      }),
      { numRuns: 300 },
    );
  });
});
