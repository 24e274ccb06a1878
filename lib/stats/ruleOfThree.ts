import { assertPositive } from './_shared/validate';

/**
 * Rule of three (Hanley, Lippman-Hand 1983, JAMA 249:1743-5): after 0 events in n cases
 * the 95 % upper confidence bound for the event probability is about 3/n (good for
 * n ≥ 30). See `zeroEventUpperBound` for the exact value.
 *
 * @example
 * ruleOfThree(20)
 * //=> 0.15
 */
export function ruleOfThree(n: number): number {
  assertPositive('n', n);
  return 3 / n;
}
