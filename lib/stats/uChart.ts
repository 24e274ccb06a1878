import { ratioChartLimits } from './_shared/ratioChart';
import { assertCount, assertPositive } from './_shared/validate';
import type { ControlChart, ControlChartPoint, RatioChartOptions, RatioChartSummary } from './controlChart';

export interface UChartInput {
  label: string;
  /** Events in this period (several may occur in one case). */
  count: number;
  /** Exposure in this period (> 0): cases, procedure hours, … */
  exposure: number;
}

export interface UChartPoint extends ControlChartPoint {
  count: number;
  exposure: number;
}

export interface UChartOptions extends RatioChartOptions {
  /** Multiply value, centre and limits by this (e.g. 100 for events per 100 cases); default 1. */
  per?: number;
}

export type UChart = ControlChart<UChartPoint> & { kind: 'u'; per: number } & RatioChartSummary;

/**
 * u chart (events per unit of exposure) with per-point limits ū ± 3√(ū/e_i), where
 * ū = Σcount/Σexposure; LCL floored at 0. Same `revise` and `exclude` options as
 * `pChart`. Every exposure must be > 0; throws RangeError otherwise.
 *
 * @example
 * uChart([{ label: 'Jan', count: 3, exposure: 100 }, { label: 'Feb', count: 5, exposure: 100 }], { per: 100 }).points[1]
 * //=> { label: 'Feb', value: 5, centre: 4, lcl: 0, ucl: 10, count: 5, exposure: 100, excluded: false } (rounded)
 */
export function uChart(points: readonly UChartInput[], options: UChartOptions = {}): UChart {
  points.forEach((p, i) => {
    assertCount(`points[${i}].count`, p.count);
    assertPositive(`points[${i}].exposure`, p.exposure);
  });
  const per = options.per ?? 1;
  assertPositive('per', per);
  const sigma = options.sigma ?? 3;
  const limits = ratioChartLimits(
    points.map((p) => ({ label: p.label, numerator: p.count, denominator: p.exposure })),
    (c, e) => Math.sqrt(c / e),
    Infinity,
    options,
  );
  return {
    kind: 'u',
    per,
    centre: limits.centre * per,
    trialCentre: limits.trialCentre * per,
    sigma,
    excludedLabels: points.filter((_, i) => limits.excluded[i]).map((p) => p.label),
    points: points.map((p, i) => ({
      label: p.label,
      value: (p.count / p.exposure) * per,
      centre: limits.centre * per,
      lcl: limits.lcl[i] * per,
      ucl: limits.ucl[i] * per,
      excluded: limits.excluded[i],
      count: p.count,
      exposure: p.exposure,
    })),
  };
}
