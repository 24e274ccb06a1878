import { wilsonInterval } from '@/lib/stats';

/** A count of cases out of a denominator, with its rate and Wilson 95 % interval. */
export interface Proportion {
  numerator: number;
  denominator: number;
  /** numerator / denominator; null when the denominator is 0. */
  rate: number | null;
  /** Wilson score 95 % limits (0 and 1 when the denominator is 0). */
  lower: number;
  upper: number;
}

/**
 * x of n with the Wilson score 95 % interval (lib/stats `wilsonInterval`, Plateau's default
 * for indicators). Assumes whole numbers 0 ≤ x ≤ n.
 *
 * @example
 * proportion(81, 263)
 * //=> { numerator: 81, denominator: 263, rate: 0.3080, lower: 0.2553, upper: 0.3662 } (rounded)
 */
export function proportion(x: number, n: number): Proportion {
  const w = wilsonInterval(x, n);
  return { numerator: x, denominator: n, rate: n === 0 ? null : w.estimate, lower: w.lower, upper: w.upper };
}
