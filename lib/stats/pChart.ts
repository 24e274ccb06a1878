import { ratioChartLimits } from './_shared/ratioChart';
import { assertCounts, assertPositive } from './_shared/validate';
import type { ControlChart, ControlChartPoint, RatioChartOptions, RatioChartSummary } from './controlChart';

export interface PChartInput {
  label: string;
  /** Cases with the event in this period. */
  x: number;
  /** Cases in this period (> 0). */
  n: number;
}

export interface PChartPoint extends ControlChartPoint {
  x: number;
  n: number;
}

export type PChartOptions = RatioChartOptions;

export type PChart = ControlChart<PChartPoint> & { kind: 'p' } & RatioChartSummary;

/**
 * p chart (fraction nonconforming) with per-point limits p̄ ± 3√(p̄(1 − p̄)/n_i), where
 * p̄ = Σx/Σn; LCL floored at 0, UCL capped at 1. `revise: true` does Montgomery's
 * revision: drop the points outside the trial limits and recompute p̄ and the limits
 * (Montgomery, Introduction to Statistical Quality Control, fraction-nonconforming chart).
 * Every n must be > 0; throws RangeError otherwise.
 *
 * @example
 * pChart([{ label: 'Jan', x: 4, n: 50 }, { label: 'Feb', x: 6, n: 50 }]).points[0]
 * //=> { label: 'Jan', value: 0.08, centre: 0.1, lcl: 0, ucl: 0.2273, x: 4, n: 50, excluded: false } (rounded)
 */
export function pChart(points: readonly PChartInput[], options: PChartOptions = {}): PChart {
  points.forEach((p, i) => {
    assertCounts(`points[${i}].x`, p.x, `points[${i}].n`, p.n);
    assertPositive(`points[${i}].n`, p.n);
  });
  const sigma = options.sigma ?? 3;
  const limits = ratioChartLimits(
    points.map((p) => ({ label: p.label, numerator: p.x, denominator: p.n })),
    (c, n) => Math.sqrt((c * (1 - c)) / n),
    1,
    options,
  );
  return {
    kind: 'p',
    centre: limits.centre,
    trialCentre: limits.trialCentre,
    sigma,
    excludedLabels: points.filter((_, i) => limits.excluded[i]).map((p) => p.label),
    points: points.map((p, i) => ({
      label: p.label,
      value: p.x / p.n,
      centre: limits.centre,
      lcl: limits.lcl[i],
      ucl: limits.ucl[i],
      excluded: limits.excluded[i],
      x: p.x,
      n: p.n,
    })),
  };
}
