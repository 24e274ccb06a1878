import { logGamma } from './logGamma';
import { normalQuantile } from './normalQuantile';

const EPSILON = 1e-16;
const TINY = 1e-300;
const MAX_ITERATIONS = 100_000;

/** Series for P(a, x), good for x < a + 1. */
function gammaSeries(a: number, x: number): number {
  let ap = a;
  let sum = 1 / a;
  let term = sum;
  for (let n = 1; n <= MAX_ITERATIONS; n++) {
    ap += 1;
    term *= x / ap;
    sum += term;
    if (Math.abs(term) < Math.abs(sum) * EPSILON) break;
  }
  return sum * Math.exp(-x + a * Math.log(x) - logGamma(a));
}

/** Continued fraction for Q(a, x) by the modified Lentz method, good for x ≥ a + 1. */
function gammaContinuedFraction(a: number, x: number): number {
  let b = x + 1 - a;
  let c = 1 / TINY;
  let d = 1 / b;
  let h = d;
  for (let i = 1; i <= MAX_ITERATIONS; i++) {
    const an = -i * (i - a);
    b += 2;
    d = an * d + b;
    if (Math.abs(d) < TINY) d = TINY;
    c = b + an / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPSILON) break;
  }
  return Math.exp(-x + a * Math.log(x) - logGamma(a)) * h;
}

/** Regularized lower incomplete gamma P(a, x) = P(X ≤ x) for X ~ Gamma(shape a, scale 1). */
export function regularizedGammaP(a: number, x: number): number {
  if (Number.isNaN(x) || !(a > 0)) return Number.NaN;
  if (x <= 0) return 0;
  if (x === Infinity) return 1;
  return x < a + 1 ? gammaSeries(a, x) : 1 - gammaContinuedFraction(a, x);
}

/** Regularized upper incomplete gamma Q(a, x) = 1 − P(a, x), without cancellation. */
export function regularizedGammaQ(a: number, x: number): number {
  if (Number.isNaN(x) || !(a > 0)) return Number.NaN;
  if (x <= 0) return 1;
  if (x === Infinity) return 0;
  return x < a + 1 ? 1 - gammaSeries(a, x) : gammaContinuedFraction(a, x);
}

function gammaDensity(a: number, x: number): number {
  return Math.exp((a - 1) * Math.log(x) - x - logGamma(a));
}

/**
 * Quantile of Gamma(shape a, scale 1): the x with P(a, x) = p.
 *
 * Wilson–Hilferty starting value (or the small-x power law for small a), then Newton's
 * method inside a bracket, falling back to bisection (or doubling while the bracket is
 * open above) whenever a step would leave it.
 */
export function gammaQuantile(p: number, a: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1 || !(a > 0)) return Number.NaN;
  if (p === 0) return 0;
  if (p === 1) return Infinity;
  let x: number;
  const z = normalQuantile(p);
  const wh = a * Math.pow(1 - 1 / (9 * a) + z / (3 * Math.sqrt(a)), 3);
  // For small p the lower tail behaves like x^a / Γ(a + 1).
  const small = Math.exp((Math.log(p) + logGamma(a + 1)) / a);
  x = wh > 0 && a > 1 ? wh : Math.min(small, Math.max(wh, 1e-3));
  if (!(x > 0) || !Number.isFinite(x)) x = a;
  let lo = 0;
  let hi = Infinity;
  for (let i = 0; i < 1000; i++) {
    const f = regularizedGammaP(a, x) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    let next = x - f / gammaDensity(a, x);
    if (!(next > lo && next < hi) || !Number.isFinite(next)) {
      next = hi === Infinity ? Math.max(2 * x, 1) : lo === 0 ? hi / 2 : (lo + hi) / 2;
    }
    if (Math.abs(next - x) <= 1e-15 * Math.max(x, 1e-300)) return next;
    x = next;
  }
  return x;
}

/** Quantile of the chi-square distribution with `df` degrees of freedom. */
export function chiSquareQuantile(p: number, df: number): number {
  return 2 * gammaQuantile(p, df / 2);
}
