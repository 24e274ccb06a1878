import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import jStat from 'jstat';
import { poissonRateInterval } from '@/lib/stats';
import { r4 } from './_helpers';

describe('a reviewer reports desaturation episodes per 1000 cases with an exact Poisson interval', () => {
  it('3 episodes in 1200 cases is 2.5 per 1000 (0.5156 to 7.3061)', () => {
    // Hand check (computed): Garwood 1936 limits χ²(0.025; 6)/2 = 0.6187 and χ²(0.975; 8)/2 = 8.7673
    // events, divided by 1.2 thousand cases; re-derived with jstat below.
    const r = poissonRateInterval(3, 1200);
    expect(r.per).toBe(1000);
    expect(r.estimate).toBe(2.5);
    expect([r4(r.lower), r4(r.upper)]).toEqual([0.5156, 7.3061]);
    expect(r.lower).toBeCloseTo((jStat.chisquare.inv(0.025, 6) / 2 / 1200) * 1000, 9);
  });

  it('per 100 gives the same interval a tenth the size', () => {
    const a = poissonRateInterval(3, 1200, { per: 1000 });
    const b = poissonRateInterval(3, 1200, { per: 100 });
    expect(b.per).toBe(100);
    expect(b.lower).toBeCloseTo(a.lower / 10, 12);
    expect(b.upper).toBeCloseTo(a.upper / 10, 12);
  });

  it('0 events gives lower exactly 0 and upper −ln(0.025) = 3.6889 events', () => {
    // Exact: χ²(0.975; 2)/2 = −ln(0.025).
    const r = poissonRateInterval(0, 1000, { per: 1000 });
    expect(r.lower).toBe(0);
    expect(r.upper).toBeCloseTo(-Math.log(0.025), 12);
  });

  it('bad input throws: no cases, negative or fractional events', () => {
    expect(() => poissonRateInterval(1, 0)).toThrow(/cases must be a finite number > 0/);
    expect(() => poissonRateInterval(-1, 10)).toThrow(/events/);
    expect(() => poissonRateInterval(0.5, 10)).toThrow(/events/);
  });

  it('matches jStat.chisquare.inv over many random counts (relative 1e-9)', () => {
    // Second reference: jstat 1.9, chi-square quantiles (Garwood limits = χ²/2).
    fc.assert(
      fc.property(fc.integer({ min: 0, max: 5000 }), fc.integer({ min: 1, max: 200000 }), (k, cases) => {
        const r = poissonRateInterval(k, cases, { per: 1000 });
        const scale = 1000 / cases;
        const lower = k === 0 ? 0 : (jStat.chisquare.inv(0.025, 2 * k) / 2) * scale;
        const upper = (jStat.chisquare.inv(0.975, 2 * k + 2) / 2) * scale;
        expect(Math.abs(r.lower - lower)).toBeLessThanOrEqual(1e-9 * Math.max(lower, 1e-300));
        expect(Math.abs(r.upper - upper)).toBeLessThanOrEqual(1e-9 * upper);
      }),
      { numRuns: 400 },
    );
  });
});
