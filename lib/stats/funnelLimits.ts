import { binomialCdf, binomialQuantile } from './_numeric/binomial';
import { normalQuantile } from './_numeric/normalQuantile';
import { assertCount, assertPositive, assertProbability } from './_shared/validate';

export interface FunnelLimitsOptions {
  /** Two-sided coverage of each pair of limits; default [0.95, 0.998] (≈ 2 and 3 SD). */
  levels?: readonly number[];
  /** 'exact' binomial (default) or the 'normal' approximation p0 ± z√(p0(1 − p0)/n). */
  method?: 'exact' | 'normal';
  /** Overdispersion factor φ: the distance of each limit from p0 is multiplied by √φ; default 1. */
  phi?: number;
}

export interface FunnelLimit {
  level: number;
  lower: number;
  upper: number;
}

/**
 * The exact binomial limit for tail probability q, with Spiegelhalter's interpolation
 * (Spiegelhalter 2005, Stat Med 24:1185-1202, appendix): r = smallest count with
 * F(r) ≥ q, α = (F(r) − q)/(F(r) − F(r − 1)), limit = (r − α)/n. This turns the step
 * function of the discrete quantile into a smooth funnel.
 */
function exactLimit(q: number, p0: number, n: number): number {
  const r = binomialQuantile(q, n, p0);
  const fr = binomialCdf(r, n, p0);
  const frMinus = binomialCdf(r - 1, n, p0);
  const alpha = fr > frMinus ? (fr - q) / (fr - frMinus) : 0;
  return (r - alpha) / n;
}

/**
 * Funnel-plot control limits for a proportion at sample size n around a target p0
 * (Spiegelhalter 2005). Exact binomial quantiles with interpolation by default; the
 * normal approximation on request. Limits are clamped to [0, 1]. Throws RangeError on
 * p0 outside [0, 1], n not a whole number > 0, a level outside (0, 1) or φ ≤ 0.
 *
 * @example
 * funnelLimits(0.1, 100)
 * //=> [{ level: 0.95, lower: 0.0404, upper: 0.1577 }, { level: 0.998, lower: 0.0142, upper: 0.1984 }] (rounded)
 */
export function funnelLimits(p0: number, n: number, options: FunnelLimitsOptions = {}): FunnelLimit[] {
  const levels = options.levels ?? [0.95, 0.998];
  const method = options.method ?? 'exact';
  const phi = options.phi ?? 1;
  assertProbability('p0', p0, false);
  assertCount('n', n);
  assertPositive('n', n);
  assertPositive('phi', phi);
  const widen = Math.sqrt(phi);
  return levels.map((level) => {
    assertProbability('level', level);
    const tail = (1 - level) / 2;
    let lower: number;
    let upper: number;
    if (method === 'normal') {
      const half = normalQuantile(1 - tail) * Math.sqrt((p0 * (1 - p0)) / n);
      lower = p0 - half;
      upper = p0 + half;
    } else {
      lower = exactLimit(tail, p0, n);
      upper = exactLimit(1 - tail, p0, n);
    }
    lower = p0 - widen * (p0 - lower);
    upper = p0 + widen * (upper - p0);
    return { level, lower: Math.min(1, Math.max(0, lower)), upper: Math.min(1, Math.max(0, upper)) };
  });
}
