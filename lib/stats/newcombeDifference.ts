import { wilsonInterval } from './wilsonInterval';
import { assertCounts, assertProbability } from './_shared/validate';
import type { ConfidenceOptions, Interval } from './types';

export type NewcombeDifferenceOptions = ConfidenceOptions;

/**
 * Interval for the difference of two independent proportions p1 − p2 by Newcombe's
 * hybrid score method (Newcombe 1998, Stat Med 17:873-890, method 10): with Wilson limits
 * (l1, u1) and (l2, u2), lower = D − √((p1 − l1)² + (u2 − p2)²) and
 * upper = D + √((u1 − p1)² + (p2 − l2)²). Use it to compare two periods or two units.
 * Both n must be > 0. Throws RangeError on bad counts.
 *
 * @example
 * newcombeDifference(56, 70, 48, 80)
 * //=> { estimate: 0.2, lower: 0.0524, upper: 0.3339 } (rounded)
 */
export function newcombeDifference(
  x1: number,
  n1: number,
  x2: number,
  n2: number,
  options: NewcombeDifferenceOptions = {},
): Interval {
  const confidence = options.confidence ?? 0.95;
  assertCounts('x1', x1, 'n1', n1);
  assertCounts('x2', x2, 'n2', n2);
  assertProbability('confidence', confidence);
  if (n1 === 0 || n2 === 0) throw new RangeError(`n1 and n2 must be > 0 (got ${n1}, ${n2})`);
  const a = wilsonInterval(x1, n1, { confidence });
  const b = wilsonInterval(x2, n2, { confidence });
  const d = a.estimate - b.estimate;
  return {
    estimate: d,
    lower: Math.max(-1, d - Math.hypot(a.estimate - a.lower, b.upper - b.estimate)),
    upper: Math.min(1, d + Math.hypot(a.upper - a.estimate, b.estimate - b.lower)),
  };
}
