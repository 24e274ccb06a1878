import { assertNonNegative, assertPositive, assertProbability } from './_shared/validate';
import type { ControlChart, ControlChartPoint } from './controlChart';

export interface GChartOptions {
  /** One label per gap (e.g. the date of the event that closed it); default '1', '2', … */
  labels?: readonly string[];
  /** Which limits go on the points (and so drive `specialCauses`); default 'sigma'. */
  limits?: 'sigma' | 'probability';
  /** Width of the sigma limits; default 3. */
  sigma?: number;
  /** Tail probability of the probability limits; default 0.00135 (Benneyan 2001). */
  tail?: number;
}

export interface GChartLimits {
  lcl: number;
  ucl: number;
}

export type GChart = ControlChart<ControlChartPoint> & {
  kind: 'g';
  /** ḡ ± 3√(ḡ(ḡ + 1)), LCL floored at 0. */
  sigmaLimits: GChartLimits;
  /** Geometric quantiles at `tail` and 1 − `tail` (whole numbers of cases). */
  probabilityLimits: GChartLimits;
  limitsUsed: 'sigma' | 'probability';
};

/**
 * Smallest k ≥ 0 with P(G ≤ k) ≥ q for G geometric on {0, 1, …} with success probability
 * p: P(G ≤ k) = 1 − (1 − p)^(k + 1).
 */
function geometricQuantile(q: number, p: number): number {
  if (p >= 1) return 0;
  const k = Math.ceil(Math.log1p(-q) / Math.log1p(-p) - 1 - 1e-9);
  return Math.max(0, k);
}

/**
 * g chart for the number of cases between rare events (Benneyan 2001, Health Care Manag
 * Sci 4:305-318). The gaps are modelled as geometric on {0, 1, …} with mean ḡ, so
 * p = 1/(ḡ + 1). Sigma limits ḡ ± 3√(ḡ(ḡ + 1)) (LCL always floors at 0); probability
 * limits are the geometric quantiles at 0.00135 and 0.99865. A point above the UCL is
 * a long event-free run (improvement); on a g chart the runs rule around the mean
 * fires more often than on a symmetric chart, because about 63 % of geometric values lie
 * below the mean. Gaps must be finite numbers ≥ 0; throws RangeError otherwise.
 *
 * @example
 * gChart([10, 30, 20]).sigmaLimits
 * //=> { lcl: 0, ucl: 81.4817 } (rounded; ḡ = 20)
 */
export function gChart(gaps: readonly number[], options: GChartOptions = {}): GChart {
  gaps.forEach((g, i) => assertNonNegative(`gaps[${i}]`, g));
  const sigma = options.sigma ?? 3;
  const tail = options.tail ?? 0.00135;
  const used = options.limits ?? 'sigma';
  assertPositive('sigma', sigma);
  assertProbability('tail', tail);
  if (options.labels && options.labels.length !== gaps.length) {
    throw new RangeError(`labels must have one entry per gap (got ${options.labels.length} for ${gaps.length})`);
  }
  const centre = gaps.length ? gaps.reduce((s, g) => s + g, 0) / gaps.length : Number.NaN;
  const half = sigma * Math.sqrt(centre * (centre + 1));
  const sigmaLimits = { lcl: Math.max(0, centre - half), ucl: centre + half };
  const p = 1 / (centre + 1);
  const probabilityLimits = { lcl: geometricQuantile(tail, p), ucl: geometricQuantile(1 - tail, p) };
  const limits = used === 'sigma' ? sigmaLimits : probabilityLimits;
  return {
    kind: 'g',
    centre,
    sigma,
    sigmaLimits,
    probabilityLimits,
    limitsUsed: used,
    points: gaps.map((g, i) => ({
      label: options.labels ? options.labels[i] : String(i + 1),
      value: g,
      centre,
      lcl: limits.lcl,
      ucl: limits.ucl,
      excluded: false,
    })),
  };
}
