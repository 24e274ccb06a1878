import { inverseRegularizedBeta } from './_numeric/incompleteBeta';
import { assertCounts, assertProbability } from './_shared/validate';
import type { ConfidenceOptions, Interval } from './types';

export type ClopperPearsonIntervalOptions = ConfidenceOptions;

/**
 * Clopper-Pearson "exact" interval (Clopper, Pearson 1934; Newcombe 1998 method 5):
 * lower = Beta quantile α/2 with shape (x, n − x + 1), upper = Beta quantile 1 − α/2
 * with shape (x + 1, n − x). Guaranteed coverage, hence conservative. 0/n gives lower 0
 * and n/n upper 1 exactly; n = 0 gives estimate NaN and 0–1.
 *
 * @example
 * clopperPearsonInterval(1, 29)
 * //=> { estimate: 0.0345, lower: 0.0009, upper: 0.1776 } (rounded)
 */
export function clopperPearsonInterval(x: number, n: number, options: ClopperPearsonIntervalOptions = {}): Interval {
  const confidence = options.confidence ?? 0.95;
  assertCounts('x', x, 'n', n);
  assertProbability('confidence', confidence);
  if (n === 0) return { estimate: Number.NaN, lower: 0, upper: 1 };
  const alpha = 1 - confidence;
  return {
    estimate: x / n,
    lower: x === 0 ? 0 : inverseRegularizedBeta(alpha / 2, x, n - x + 1),
    upper: x === n ? 1 : inverseRegularizedBeta(1 - alpha / 2, x + 1, n - x),
  };
}
