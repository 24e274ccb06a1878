import { quantile } from './quantile';

/**
 * Median: `quantile(values, 0.5)`, the middle value, or the mean of the two middle
 * values for an even count. Empty list gives NaN.
 *
 * @example
 * median([60, 5, 240, 30])
 * //=> 45
 */
export function median(values: readonly number[]): number {
  return quantile(values, 0.5);
}
