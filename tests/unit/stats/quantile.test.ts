import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { median, quantile } from '@/lib/stats';

// Method: Hyndman RJ, Fan Y 1996, "Sample quantiles in statistical packages", Am Stat 50:361-5,
// type 7 (R's default). Check values are R's quantile() results, hand computed from the definition.
describe('response times are summarised by the median and the 90th percentile', () => {
  it('type 7 on 1..10: R gives 9.1 for the 90th percentile and 5.5 for the median', () => {
    const v = [3, 1, 4, 10, 5, 9, 2, 6, 8, 7];
    expect(quantile(v, 0.9)).toBeCloseTo(9.1, 14);
    expect(median(v)).toBe(5.5);
    expect(quantile(v, 0)).toBe(1);
    expect(quantile(v, 1)).toBe(10);
    expect(quantile(v, 0.25)).toBeCloseTo(3.25, 14);
  });

  it('seconds from desaturation to intervention: median 45, 90th percentile 168', () => {
    // h = (5 − 1) × 0.9 = 3.6 → 60 + 0.6 × (240 − 60) = 168.
    expect(quantile([12, 30, 45, 60, 240], 0.9)).toBeCloseTo(168, 12);
    expect(median([60, 5, 240, 30])).toBe(45);
  });

  it('does not change the input, handles one value, and returns NaN for none', () => {
    const v = [5, 1, 3];
    quantile(v, 0.5);
    expect(v).toEqual([5, 1, 3]);
    expect(quantile([42], 0.9)).toBe(42);
    expect(median([])).toBeNaN();
  });

  it('bad p or values throw', () => {
    expect(() => quantile([1, 2], 1.1)).toThrow(/p must lie in \[0, 1\]/);
    expect(() => quantile([1, Number.NaN], 0.5)).toThrow(/values\[1\]/);
  });

  it('is monotone in p and lies between min and max', () => {
    fc.assert(
      fc.property(
        fc.array(fc.double({ min: -1e6, max: 1e6, noNaN: true }), { minLength: 1, maxLength: 50 }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        fc.double({ min: 0, max: 1, noNaN: true }),
        (values, a, b) => {
          const [lo, hi] = a < b ? [a, b] : [b, a];
          expect(quantile(values, lo)).toBeLessThanOrEqual(quantile(values, hi) + 1e-9);
          expect(quantile(values, lo)).toBeGreaterThanOrEqual(Math.min(...values));
          expect(quantile(values, hi)).toBeLessThanOrEqual(Math.max(...values));
        },
      ),
    );
  });
});
