import { funnelLimits, type FunnelLimit, type FunnelLimitsOptions } from './funnelLimits';
import { assertCounts, assertPositive, assertProbability } from './_shared/validate';

export interface FunnelUnitInput {
  label: string;
  /** Cases with the event. */
  x: number;
  /** Cases (> 0). */
  n: number;
}

export interface FunnelPlotOptions extends FunnelLimitsOptions {
  /** How many n values the drawn curve has (log-spaced whole numbers); default 100. */
  curvePoints?: number;
  /** Range of n for the curve; default [smallest n, largest n] of the units. */
  curveRange?: readonly [number, number];
}

export interface FunnelUnitLimit extends FunnelLimit {
  /** Where the unit's proportion lies against this pair of limits (strictly outside). */
  outside: 'above' | 'below' | null;
}

export interface FunnelUnit {
  label: string;
  x: number;
  n: number;
  proportion: number;
  /** Limits at this unit's n, one entry per level. */
  limits: FunnelUnitLimit[];
}

export interface FunnelPlot {
  /** The target: the one given, or the pooled Σx/Σn. */
  p0: number;
  phi: number;
  method: 'exact' | 'normal';
  levels: number[];
  units: FunnelUnit[];
  /** Limits along n for drawing the funnel, in increasing n. */
  curve: { n: number; limits: FunnelLimit[] }[];
}

/** Whole numbers from lo to hi, spaced evenly on a log scale, deduplicated. */
function curveSizes(lo: number, hi: number, count: number): number[] {
  const a = Math.max(1, Math.floor(lo));
  const b = Math.max(a, Math.ceil(hi));
  if (count <= 1 || a === b) return [a, b].filter((v, i, all) => all.indexOf(v) === i);
  const sizes = new Set<number>();
  for (let i = 0; i < count; i++) {
    sizes.add(Math.round(Math.exp(Math.log(a) + ((Math.log(b) - Math.log(a)) * i) / (count - 1))));
  }
  return [...sizes].sort((u, v) => u - v);
}

/**
 * Funnel plot data for comparing units' proportions with a target (Spiegelhalter 2005,
 * Stat Med 24:1185-1202): each unit's proportion, its limits at its own n and whether it
 * lies outside each level, plus curve points for drawing. p0 defaults to the pooled
 * proportion. Options as `funnelLimits`, including φ (see `overdispersionFactor`).
 *
 * @example
 * funnelPlot([{ label: 'A', x: 30, n: 100 }, { label: 'B', x: 70, n: 900 }]).units[0].limits[1]
 * //=> { level: 0.998, lower: 0.0142, upper: 0.1984, outside: 'above' } (rounded; p0 = 0.1)
 */
export function funnelPlot(units: readonly FunnelUnitInput[], p0?: number, options: FunnelPlotOptions = {}): FunnelPlot {
  units.forEach((u, i) => {
    assertCounts(`units[${i}].x`, u.x, `units[${i}].n`, u.n);
    assertPositive(`units[${i}].n`, u.n);
  });
  const levels = [...(options.levels ?? [0.95, 0.998])];
  const method = options.method ?? 'exact';
  const phi = options.phi ?? 1;
  const target = p0 ?? units.reduce((s, u) => s + u.x, 0) / units.reduce((s, u) => s + u.n, 0);
  assertProbability('p0', target, false);
  const limitOptions: FunnelLimitsOptions = { levels, method, phi };
  const [lo, hi] =
    options.curveRange ??
    units.reduce<[number, number]>(([min, max], u) => [Math.min(min, u.n), Math.max(max, u.n)], [Infinity, -Infinity]);
  return {
    p0: target,
    phi,
    method,
    levels,
    units: units.map((u) => {
      const proportion = u.x / u.n;
      return {
        label: u.label,
        x: u.x,
        n: u.n,
        proportion,
        limits: funnelLimits(target, u.n, limitOptions).map((l) => ({
          ...l,
          outside: proportion > l.upper ? 'above' : proportion < l.lower ? 'below' : null,
        })),
      };
    }),
    curve: units.length
      ? curveSizes(lo, hi, options.curvePoints ?? 100).map((n) => ({ n, limits: funnelLimits(target, n, limitOptions) }))
      : [],
  };
}
