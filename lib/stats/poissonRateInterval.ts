import { poissonCountLimits } from './_numeric/poissonCountLimits';
import { assertCount, assertPositive, assertProbability } from './_shared/validate';
import type { ConfidenceOptions, Interval } from './types';

export interface PoissonRateIntervalOptions extends ConfidenceOptions {
  /** Express the rate per this many cases; default 1000. */
  per?: 100 | 1000;
}

export interface PoissonRateInterval extends Interval {
  /** The multiplier used: estimate, lower and upper are events per `per` cases. */
  per: 100 | 1000;
}

/**
 * Exact Poisson interval for an event count (Garwood 1936), as a rate per 100 or
 * 1000 cases: lower = χ²(α/2; 2k)/2, upper = χ²(1 − α/2; 2k + 2)/2, both divided by the
 * number of cases. Use it for events that can happen more than once per case
 * (e.g. desaturation episodes); for "cases with at least one event" use a proportion
 * interval. 0 events gives lower 0 exactly. Throws RangeError on bad counts or
 * cases = 0.
 *
 * @example
 * poissonRateInterval(3, 1200, { per: 1000 })
 * //=> { estimate: 2.5, lower: 0.5156, upper: 7.3061, per: 1000 } (rounded)
 */
export function poissonRateInterval(
  events: number,
  cases: number,
  options: PoissonRateIntervalOptions = {},
): PoissonRateInterval {
  const confidence = options.confidence ?? 0.95;
  const per = options.per ?? 1000;
  assertCount('events', events);
  assertPositive('cases', cases);
  assertProbability('confidence', confidence);
  const limits = poissonCountLimits(events, confidence);
  const scale = per / cases;
  return { estimate: events * scale, lower: limits.lower * scale, upper: limits.upper * scale, per };
}
