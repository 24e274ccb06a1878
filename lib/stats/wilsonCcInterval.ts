import { twoSidedZ } from './_numeric/normalQuantile';
import { assertCounts, assertProbability } from './_shared/validate';
import type { ConfidenceOptions, Interval } from './types';

export type WilsonCcIntervalOptions = ConfidenceOptions;

/**
 * Wilson score interval with continuity correction (Newcombe 1998 method 4, after
 * Fleiss). Wider than plain Wilson; use where a conservative interval is wanted without
 * going fully exact. Same edge handling as `wilsonInterval`.
 *
 * @example
 * wilsonCcInterval(0, 20)
 * //=> { estimate: 0, lower: 0, upper: 0.2005 } (rounded)
 */
export function wilsonCcInterval(x: number, n: number, options: WilsonCcIntervalOptions = {}): Interval {
  const confidence = options.confidence ?? 0.95;
  assertCounts('x', x, 'n', n);
  assertProbability('confidence', confidence);
  if (n === 0) return { estimate: Number.NaN, lower: 0, upper: 1 };
  const z = twoSidedZ(confidence);
  const z2 = z * z;
  const p = x / n;
  const denominator = 2 * (n + z2);
  const lower =
    x === 0 ? 0 : (2 * n * p + z2 - 1 - z * Math.sqrt(z2 - 2 - 1 / n + 4 * p * (n * (1 - p) + 1))) / denominator;
  const upper =
    x === n ? 1 : (2 * n * p + z2 + 1 + z * Math.sqrt(z2 + 2 - 1 / n + 4 * p * (n * (1 - p) - 1))) / denominator;
  return { estimate: p, lower: Math.max(0, lower), upper: Math.min(1, upper) };
}
