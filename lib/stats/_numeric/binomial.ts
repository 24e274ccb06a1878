import { regularizedBeta } from './incompleteBeta';

/** P(X ≤ k) for X ~ Binomial(n, p); exact through I_{1−p}(n − k, k + 1). */
export function binomialCdf(k: number, n: number, p: number): number {
  if (k < 0) return 0;
  if (k >= n) return 1;
  if (p <= 0) return 1;
  if (p >= 1) return 0;
  const kk = Math.floor(k);
  return regularizedBeta(1 - p, n - kk, kk + 1);
}

/** Smallest integer r in [0, n] with P(X ≤ r) ≥ q, for X ~ Binomial(n, p). Bisection on r. */
export function binomialQuantile(q: number, n: number, p: number): number {
  if (q <= 0) return 0;
  let lo = -1; // F(lo) < q (F(−1) = 0)
  let hi = n; // F(hi) ≥ q (F(n) = 1)
  while (hi - lo > 1) {
    const mid = Math.floor((lo + hi) / 2);
    if (binomialCdf(mid, n, p) >= q) hi = mid;
    else lo = mid;
  }
  return hi;
}
