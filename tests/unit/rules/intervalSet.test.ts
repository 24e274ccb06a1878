import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import {
  filterMinDuration,
  intervalClip,
  intervalContains,
  intervalContainsBefore,
  intervalDifference,
  intervalIntersection,
  intervalSetFromPairs,
  intervalSetToPairs,
  intervalTotal,
  intervalUnion,
  mergeGaps,
  type IntervalSet,
} from '@/lib/rules';

/** Membership by brute force on a grid of half-integers (sets below use integer bounds). */
function member(set: IntervalSet, x: number): boolean {
  for (let i = 0; i < set.length; i += 2) if (set[i] <= x && x < set[i + 1]) return true;
  return false;
}

function isNormal(set: IntervalSet): boolean {
  for (let i = 0; i < set.length; i += 2) {
    if (!(set[i] < set[i + 1])) return false;
    if (i > 0 && !(set[i - 1] < set[i])) return false;
  }
  return set.length % 2 === 0;
}

const pairs = fc.array(fc.tuple(fc.integer({ min: 0, max: 60 }), fc.integer({ min: 0, max: 12 })).map(([s, d]) => [s, s + d] as [number, number]), { maxLength: 8 });
const set = pairs.map((p) => intervalSetFromPairs(p));
const grid = Array.from({ length: 150 }, (_, i) => i / 2);

describe('interval sets', () => {
  it('normalises unsorted, overlapping, touching and empty pairs into one sorted list', () => {
    expect(intervalSetFromPairs([[5, 8], [0, 2], [2, 3], [4, 4]])).toEqual([0, 3, 5, 8]);
    expect(intervalSetToPairs([0, 3, 5, 8])).toEqual([[0, 3], [5, 8]]);
  });

  it('joins touching intervals in a union because [0,2) and [2,3) leave no instant out', () => {
    expect(intervalUnion([0, 2], [2, 3])).toEqual([0, 3]);
    expect(intervalUnion([0, 2, 6, 8], [1, 3, 8, 9])).toEqual([0, 3, 6, 9]);
  });

  it('keeps an intersection empty where half-open intervals only touch', () => {
    expect(intervalIntersection([0, 2], [2, 4])).toEqual([]);
    expect(intervalIntersection([0, 5, 7, 10], [3, 8])).toEqual([3, 5, 7, 8]);
  });

  it('cuts holes with a difference', () => {
    expect(intervalDifference([0, 10], [2, 3, 5, 6])).toEqual([0, 2, 3, 5, 6, 10]);
    expect(intervalDifference([0, 10], [-5, 20])).toEqual([]);
    expect(intervalDifference([0, 4, 6, 10], [3, 7])).toEqual([0, 3, 7, 10]);
  });

  it('keeps an interval of exactly the minimum duration and drops one a second short', () => {
    expect(filterMinDuration([0, 19, 30, 50], 20)).toEqual([30, 50]);
    expect(filterMinDuration([0, 20], 20)).toEqual([0, 20]);
    expect(filterMinDuration([0.1, 20.1 - 1e-12], 20)).toEqual([0.1, 20.1 - 1e-12]);
  });

  it('merges gaps shorter than the merge gap but not a gap of exactly that length', () => {
    expect(mergeGaps([0, 10, 13, 20, 30, 40], 5)).toEqual([0, 20, 30, 40]);
    expect(mergeGaps([0, 10, 15, 20], 5)).toEqual([0, 10, 15, 20]);
    expect(mergeGaps([0, 10, 15, 20], 0)).toEqual([0, 10, 15, 20]);
  });

  it('answers point queries at both edges of a half-open interval', () => {
    expect(intervalContains([0, 5], 0)).toBe(true);
    expect(intervalContains([0, 5], 5)).toBe(false);
    expect(intervalContainsBefore([0, 5], 5)).toBe(true);
    expect(intervalContainsBefore([0, 5], 0)).toBe(false);
    expect(intervalContainsBefore([0, 5, 7, 9], 6)).toBe(false);
    expect(intervalClip([0, 10, 20, 30], 5, 25)).toEqual([5, 10, 20, 25]);
    expect(intervalTotal([0, 3, 5, 8])).toBe(6);
  });

  it('agrees with point-by-point set algebra on random sets', () => {
    fc.assert(
      fc.property(set, set, (a, b) => {
        const u = intervalUnion(a, b);
        const n = intervalIntersection(a, b);
        const d = intervalDifference(a, b);
        expect(isNormal(u) && isNormal(n) && isNormal(d)).toBe(true);
        for (const x of grid) {
          expect(member(u, x)).toBe(member(a, x) || member(b, x));
          expect(member(n, x)).toBe(member(a, x) && member(b, x));
          expect(member(d, x)).toBe(member(a, x) && !member(b, x));
          expect(intervalContains(a, x)).toBe(member(a, x));
          expect(intervalContainsBefore(a, x)).toBe(member(a, x - 0.25));
        }
        expect(intervalTotal(u) + intervalTotal(n)).toBeCloseTo(intervalTotal(a) + intervalTotal(b), 9);
      }),
    );
  });
});
