import type { RatioChartOptions } from '../controlChart';

export interface RatioInput {
  label: string;
  numerator: number;
  denominator: number;
}

export interface RatioLimits {
  centre: number;
  trialCentre: number;
  excluded: boolean[];
  lcl: number[];
  ucl: number[];
}

/**
 * Centre Σnumerator / Σdenominator over the included points, limits
 * centre ± sigma · standardError(centre, denominator_i), with optional one-round revision.
 * Shared by the p and u charts; only the standard error and the cap differ.
 */
export function ratioChartLimits(
  points: readonly RatioInput[],
  standardError: (centre: number, denominator: number) => number,
  cap: number,
  options: RatioChartOptions,
): RatioLimits {
  const sigma = options.sigma ?? 3;
  const excludeLabels = new Set(options.exclude ?? []);
  const excluded = points.map((p) => excludeLabels.has(p.label));
  const centreOf = (): number => {
    let num = 0;
    let den = 0;
    points.forEach((p, i) => {
      if (!excluded[i]) {
        num += p.numerator;
        den += p.denominator;
      }
    });
    return den > 0 ? num / den : Number.NaN;
  };
  const limitsAt = (centre: number) => {
    const lcl: number[] = [];
    const ucl: number[] = [];
    for (const p of points) {
      const half = sigma * standardError(centre, p.denominator);
      lcl.push(Math.max(0, centre - half));
      ucl.push(Math.min(cap, centre + half));
    }
    return { lcl, ucl };
  };
  const trialCentre = centreOf();
  let centre = trialCentre;
  let limits = limitsAt(centre);
  if (options.revise) {
    let changed = false;
    points.forEach((p, i) => {
      const value = p.numerator / p.denominator;
      if (!excluded[i] && (value > limits.ucl[i] || value < limits.lcl[i])) {
        excluded[i] = true;
        changed = true;
      }
    });
    if (changed) {
      centre = centreOf();
      limits = limitsAt(centre);
    }
  }
  return { centre, trialCentre, excluded, ...limits };
}
