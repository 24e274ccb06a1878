import { quantile } from './quantile';
import { assertCounts, assertPositive, assertProbability } from './_shared/validate';

export interface OverdispersionFactorOptions {
  /** Fraction of z-scores pulled in at each end before averaging; default 0.1. 0 turns it off. */
  winsorize?: number;
}

/**
 * Multiplicative overdispersion φ for a funnel plot (Spiegelhalter 2005, Stat Med
 * 24:1185-1202, from memory): φ̂ = mean of z_i², z_i = (p_i − p0)/√(p0(1 − p0)/n_i),
 * after winsorizing the z-scores at the 10th and 90th percentiles (type 7) so that the
 * outliers being looked for do not inflate φ. Pass φ̂ to `funnelPlot` only when it is
 * clearly above 1 (e.g. I·φ̂ above the χ²(I − 1) 95th percentile); a value below 1 is
 * usually left at 1.
 *
 * @example
 * overdispersionFactor([{ x: 5, n: 100 }, { x: 15, n: 100 }, { x: 10, n: 100 }], 0.1, { winsorize: 0 })
 * //=> 1.8519 (rounded)
 */
export function overdispersionFactor(
  units: readonly { x: number; n: number }[],
  p0: number,
  options: OverdispersionFactorOptions = {},
): number {
  const winsorize = options.winsorize ?? 0.1;
  assertProbability('p0', p0);
  if (!(winsorize >= 0 && winsorize < 0.5)) throw new RangeError(`winsorize must lie in [0, 0.5) (got ${winsorize})`);
  units.forEach((u, i) => {
    assertCounts(`units[${i}].x`, u.x, `units[${i}].n`, u.n);
    assertPositive(`units[${i}].n`, u.n);
  });
  if (units.length === 0) return Number.NaN;
  let z = units.map((u) => (u.x / u.n - p0) / Math.sqrt((p0 * (1 - p0)) / u.n));
  if (winsorize > 0) {
    const lo = quantile(z, winsorize);
    const hi = quantile(z, 1 - winsorize);
    z = z.map((v) => Math.min(hi, Math.max(lo, v)));
  }
  return z.reduce((s, v) => s + v * v, 0) / z.length;
}
