import { logBeta } from './logGamma';

const EPSILON = 1e-16;
const TINY = 1e-300;
const MAX_ITERATIONS = 100_000;

/**
 * Continued fraction for I_x(a, b) by the modified Lentz method
 * (Lentz WJ 1976; Thompson IJ, Barnett AR 1986; the form in Press et al., Numerical Recipes, §6.4).
 * Converges quickly for x < (a + 1) / (a + b + 2).
 */
function betaContinuedFraction(x: number, a: number, b: number): number {
  const qab = a + b;
  const qap = a + 1;
  const qam = a - 1;
  let c = 1;
  let d = 1 - (qab * x) / qap;
  if (Math.abs(d) < TINY) d = TINY;
  d = 1 / d;
  let h = d;
  for (let m = 1; m <= MAX_ITERATIONS; m++) {
    const m2 = 2 * m;
    // Even step.
    let aa = (m * (b - m) * x) / ((qam + m2) * (a + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    h *= d * c;
    // Odd step.
    aa = (-(a + m) * (qab + m) * x) / ((a + m2) * (qap + m2));
    d = 1 + aa * d;
    if (Math.abs(d) < TINY) d = TINY;
    c = 1 + aa / c;
    if (Math.abs(c) < TINY) c = TINY;
    d = 1 / d;
    const delta = d * c;
    h *= delta;
    if (Math.abs(delta - 1) < EPSILON) return h;
  }
  return h;
}

/** log of x^a (1 − x)^b / B(a, b), the factor in front of the continued fraction. */
function logFrontFactor(x: number, a: number, b: number): number {
  return a * Math.log(x) + b * Math.log1p(-x) - logBeta(a, b);
}

/**
 * Regularized incomplete beta function I_x(a, b) = P(X ≤ x) for X ~ Beta(a, b), a, b > 0.
 * Uses the symmetry I_x(a, b) = 1 − I_{1−x}(b, a) so the continued fraction is always
 * evaluated where it converges fast.
 */
export function regularizedBeta(x: number, a: number, b: number): number {
  if (Number.isNaN(x) || !(a > 0) || !(b > 0)) return Number.NaN;
  if (x <= 0) return 0;
  if (x >= 1) return 1;
  if (x < (a + 1) / (a + b + 2)) {
    return (Math.exp(logFrontFactor(x, a, b)) * betaContinuedFraction(x, a, b)) / a;
  }
  return 1 - (Math.exp(logFrontFactor(1 - x, b, a)) * betaContinuedFraction(1 - x, b, a)) / b;
}

/**
 * Upper tail 1 − I_x(a, b), computed without cancellation when it is small.
 */
export function regularizedBetaUpper(x: number, a: number, b: number): number {
  if (Number.isNaN(x) || !(a > 0) || !(b > 0)) return Number.NaN;
  if (x <= 0) return 1;
  if (x >= 1) return 0;
  return regularizedBeta(1 - x, b, a);
}

/** Beta(a, b) density at x in (0, 1). */
function betaDensity(x: number, a: number, b: number): number {
  return Math.exp((a - 1) * Math.log(x) + (b - 1) * Math.log1p(-x) - logBeta(a, b));
}

/** Starting value (Abramowitz & Stegun 26.5.22 for a, b ≥ 1; tail power law otherwise). */
function initialGuess(p: number, a: number, b: number): number {
  if (a >= 1 && b >= 1) {
    const pp = p < 0.5 ? p : 1 - p;
    const t = Math.sqrt(-2 * Math.log(pp));
    let y = (2.30753 + t * 0.27061) / (1 + t * (0.99229 + t * 0.04481)) - t;
    if (p < 0.5) y = -y;
    const al = (y * y - 3) / 6;
    const h = 2 / (1 / (2 * a - 1) + 1 / (2 * b - 1));
    const w = (y * Math.sqrt(al + h)) / h - (1 / (2 * b - 1) - 1 / (2 * a - 1)) * (al + 5 / 6 - 2 / (3 * h));
    return a / (a + b * Math.exp(2 * w));
  }
  const lna = Math.log(a / (a + b));
  const lnb = Math.log(b / (a + b));
  const t = Math.exp(a * lna) / a;
  const u = Math.exp(b * lnb) / b;
  const w = t + u;
  if (p < t / w) return Math.pow(a * w * p, 1 / a);
  return 1 - Math.pow(b * w * (1 - p), 1 / b);
}

/**
 * Inverse of the regularized incomplete beta: the x in [0, 1] with I_x(a, b) = p.
 *
 * Newton's method from the Abramowitz & Stegun starting value, kept inside a shrinking
 * bracket: whenever a Newton step leaves the bracket the step is replaced by bisection,
 * so the iteration always converges. Stops when the step is below 1e-15 relative.
 */
export function inverseRegularizedBeta(p: number, a: number, b: number): number {
  if (Number.isNaN(p) || p < 0 || p > 1 || !(a > 0) || !(b > 0)) return Number.NaN;
  if (p === 0) return 0;
  if (p === 1) return 1;
  let lo = 0;
  let hi = 1;
  let x = initialGuess(p, a, b);
  if (!(x > 0 && x < 1)) x = 0.5;
  for (let i = 0; i < 1000; i++) {
    const f = regularizedBeta(x, a, b) - p;
    if (f === 0) return x;
    if (f < 0) lo = x;
    else hi = x;
    const density = betaDensity(x, a, b);
    let next = x - f / density;
    if (!(next > lo && next < hi) || !Number.isFinite(next)) next = lo === 0 ? hi / 2 : (lo + hi) / 2;
    if (Math.abs(next - x) <= 1e-15 * Math.max(x, 1e-300) || hi - lo <= 1e-15 * lo) return next;
    x = next;
  }
  return x;
}
