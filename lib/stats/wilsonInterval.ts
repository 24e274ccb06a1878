import { twoSidedZ } from './_numeric/normalQuantile';
import { assertCounts, assertProbability } from './_shared/validate';
import type { ConfidenceOptions, Interval } from './types';

export type WilsonIntervalOptions = ConfidenceOptions;

/**
 * Wilson score interval for a proportion x/n (Wilson 1927; Newcombe 1998 method 3).
 * Good coverage at small n without the conservatism of the exact interval; the default
 * for Plateau's indicators. 0/n gives lower 0 and n/n upper 1 exactly; n = 0 gives
 * estimate NaN and the uninformative interval 0–1. Throws RangeError on bad counts.
 *
 * @example
 * wilsonInterval(81, 263)
 * //=> { estimate: 0.3080, lower: 0.2553, upper: 0.3662 } (rounded)
 */
export function wilsonInterval(x: number, n: number, options: WilsonIntervalOptions = {}): Interval {
  const confidence = options.confidence ?? 0.95;
  assertCounts('x', x, 'n', n);
  assertProbability('confidence', confidence);
  if (n === 0) return { estimate: Number.NaN, lower: 0, upper: 1 };
  const z = twoSidedZ(confidence);
  const z2 = z * z;
  const p = x / n;
  const centre = (x + z2 / 2) / (n + z2);
  const half = (z * Math.sqrt((x * (n - x)) / n + z2 / 4)) / (n + z2);
  return {
    estimate: p,
    lower: x === 0 ? 0 : Math.max(0, centre - half),
    upper: x === n ? 1 : Math.min(1, centre + half),
  };
}
