import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import jStat from 'jstat';
import { quantileInterval } from '@/lib/review';

describe('distribution-free intervals for a quantile', () => {
  it('gives the 2nd and 9th of 10 ordered values for the median (the classic table, Conover 1999, from memory)', () => {
    const values = [60, 5, 8, 12, 15, 18, 20, 22, 30, 41];
    expect(quantileInterval(values, 0.5)).toEqual({ value: 19, lower: 8, upper: 41 });
  });

  it('has no lower limit for the median of 5 values (no pair of ranks reaches 95 %)', () => {
    expect(quantileInterval([1, 2, 3, 4, 5], 0.5)).toEqual({ value: 3, lower: null, upper: null });
  });

  it('picks the ranks whose binomial coverage is at least 95 %, checked with jstat', () => {
    fc.assert(
      fc.property(fc.integer({ min: 6, max: 300 }), fc.constantFrom(0.5, 0.9), (n, p) => {
        const values = Array.from({ length: n }, (_, i) => i + 1);
        const q = quantileInterval(values, p);
        const l = q.lower ?? 0;
        const u = q.upper ?? n + 1;
        // P(l ≤ B ≤ u − 1) for B ~ Bin(n, p): the chance that x(l) ≤ quantile < x(u).
        const cover = jStat.binomial.cdf(u - 1, n, p) - (l >= 1 ? jStat.binomial.cdf(l - 1, n, p) : 0);
        if (q.lower !== null && q.upper !== null) expect(cover).toBeGreaterThanOrEqual(0.95 - 1e-9);
        // each limit is the tightest: one rank further in loses its tail below 2.5 %
        if (q.lower !== null) expect(jStat.binomial.cdf(l, n, p)).toBeGreaterThan(0.025 - 1e-12);
        if (q.upper !== null && u >= 2) expect(jStat.binomial.cdf(u - 2, n, p)).toBeLessThan(0.975 + 1e-12);
      }),
      { numRuns: 120 },
    );
  });

  it('is empty without values', () => {
    expect(quantileInterval([], 0.9)).toEqual({ value: null, lower: null, upper: null });
  });
});
