import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { newcombeDifference, wilsonInterval } from '@/lib/stats';
import { r4 } from './_helpers';

// Source: Newcombe RG 1998, "Interval estimation for the difference between independent
// proportions: comparison of eleven methods", Stat Med 17:873-890, Table II, method 10
// (hybrid score). FROM MEMORY: the paper's eight examples as we remember them; our values
// agree with all eight to 4 decimals, which supports both.
const NEWCOMBE_1998_DIFFERENCE_FROM_MEMORY: [number, number, number, number, number, number][] = [
  [56, 70, 48, 80, 0.0524, 0.3339],
  [9, 10, 3, 10, 0.1705, 0.809],
  [6, 7, 2, 7, 0.0582, 0.8062],
  [5, 56, 0, 29, -0.0381, 0.1926],
  [0, 10, 0, 20, -0.1611, 0.2775],
  [0, 10, 0, 10, -0.2775, 0.2775],
  [10, 10, 0, 20, 0.6791, 1],
  [10, 10, 0, 10, 0.6075, 1],
];

describe('a reviewer compares this quarter with last quarter', () => {
  for (const [x1, n1, x2, n2, lower, upper] of NEWCOMBE_1998_DIFFERENCE_FROM_MEMORY) {
    it(`${x1}/${n1} − ${x2}/${n2} gives Newcombe's method 10 limits ${lower} to ${upper}`, () => {
      // Newcombe 1998, Stat Med 17:873-890, Table II, method 10 (from memory).
      const d = newcombeDifference(x1, n1, x2, n2);
      expect(d.estimate).toBeCloseTo(x1 / n1 - x2 / n2, 15);
      expect([r4(d.lower), r4(d.upper)]).toEqual([lower, upper]);
    });
  }

  it('swapping the groups mirrors the interval', () => {
    fc.assert(
      fc.property(
        fc.integer({ min: 1, max: 400 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n))),
        fc.integer({ min: 1, max: 400 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n))),
        ([x1, n1], [x2, n2]) => {
          const a = newcombeDifference(x1, n1, x2, n2);
          const b = newcombeDifference(x2, n2, x1, n1);
          expect(a.lower).toBeCloseTo(-b.upper, 12);
          expect(a.upper).toBeCloseTo(-b.lower, 12);
          expect(a.lower).toBeLessThanOrEqual(a.estimate + 1e-15);
          expect(a.upper).toBeGreaterThanOrEqual(a.estimate - 1e-15);
        },
      ),
      { numRuns: 200 },
    );
  });

  it('is built from the two Wilson intervals (the definition, checked once by hand)', () => {
    const a = wilsonInterval(56, 70);
    const b = wilsonInterval(48, 80);
    const d = newcombeDifference(56, 70, 48, 80);
    expect(d.lower).toBeCloseTo(0.2 - Math.sqrt((0.8 - a.lower) ** 2 + (b.upper - 0.6) ** 2), 14);
    expect(d.upper).toBeCloseTo(0.2 + Math.sqrt((a.upper - 0.8) ** 2 + (0.6 - b.lower) ** 2), 14);
  });

  it('an empty group throws', () => {
    expect(() => newcombeDifference(0, 0, 1, 10)).toThrow(/n1 and n2 must be > 0/);
    expect(() => newcombeDifference(11, 10, 1, 10)).toThrow(/x1 must not exceed n1/);
  });
});
