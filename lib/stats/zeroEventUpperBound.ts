import { assertPositive, assertProbability } from './_shared/validate';
import type { ConfidenceOptions } from './types';

export type ZeroEventUpperBoundOptions = ConfidenceOptions;

/**
 * Exact one-sided upper confidence bound for a probability after 0 events in n cases:
 * the p with (1 − p)^n = 1 − confidence, i.e. 1 − 0.05^(1/n) at 95 % (Hanley,
 * Lippman-Hand 1983). Note this is one-sided: at the same confidence it is lower than the
 * two-sided Clopper-Pearson upper limit for 0/n.
 *
 * @example
 * zeroEventUpperBound(20)
 * //=> 0.1391 (rounded)
 */
export function zeroEventUpperBound(n: number, options: ZeroEventUpperBoundOptions = {}): number {
  const confidence = options.confidence ?? 0.95;
  assertPositive('n', n);
  assertProbability('confidence', confidence);
  return -Math.expm1(Math.log(1 - confidence) / n);
}
