import { quantile } from '@/lib/stats';

export interface QuantileEstimate {
  /** Sample quantile (Hyndman & Fan type 7, lib/stats `quantile`); null without values. */
  value: number | null;
  /**
   * Distribution-free 95 % limits from order statistics: x(l) and x(u) with
   * P(l ≤ B ≤ u − 1) ≥ 0.95 for B ~ Binomial(n, p) (Conover 1999, Practical Nonparametric
   * Statistics, §3.2, from memory). Null when n is too small for the limit to exist.
   */
  lower: number | null;
  upper: number | null;
}

/** Binomial(n, p) CDF at 0…n, through log-space pmf (no underflow at large n). */
function binomialCdf(n: number, p: number): Float64Array {
  const logPmf = new Float64Array(n + 1);
  const lp = Math.log(p);
  const lq = Math.log1p(-p);
  logPmf[0] = n * lq;
  for (let k = 0; k < n; k++) logPmf[k + 1] = logPmf[k] + Math.log(n - k) - Math.log(k + 1) + lp - lq;
  let max = -Infinity;
  for (const v of logPmf) max = Math.max(max, v);
  const cdf = new Float64Array(n + 1);
  let total = 0;
  for (let k = 0; k <= n; k++) total += Math.exp(logPmf[k] - max);
  let run = 0;
  for (let k = 0; k <= n; k++) {
    run += Math.exp(logPmf[k] - max);
    cdf[k] = run / total;
  }
  return cdf;
}

/**
 * The p-quantile of `values` with a distribution-free 95 % interval. Assumes finite values
 * and 0 < p < 1.
 *
 * @example
 * quantileInterval([5, 8, 12, 15, 18, 20, 22, 30, 41, 60], 0.5)
 * //=> { value: 19, lower: 8, upper: 41 }
 */
export function quantileInterval(values: readonly number[], p: number): QuantileEstimate {
  const n = values.length;
  if (n === 0) return { value: null, lower: null, upper: null };
  const sorted = [...values].sort((a, b) => a - b);
  const cdf = binomialCdf(n, p);
  const alpha = 0.05;
  const at = (k: number) => (k < 0 ? 0 : cdf[Math.min(k, n)]);
  // l: the largest rank with P(B ≤ l − 1) ≤ α/2; u: the smallest with P(B ≤ u − 1) ≥ 1 − α/2.
  let l = 0;
  while (l + 1 <= n && at(l) <= alpha / 2) l++;
  let u = 1;
  while (u <= n && at(u - 1) < 1 - alpha / 2) u++;
  return {
    value: quantile(sorted, p),
    lower: l >= 1 ? sorted[l - 1] : null,
    upper: u <= n ? sorted[u - 1] : null,
  };
}
