import type { StatsRow } from '@/lib/domain/statsRow';
import { funnelPlot, type FunnelLimit } from '@/lib/stats';
import { hasSummary, type FigureDef, type FigureId } from './figures';
import { dimensionValue, type DimensionId } from './dimensions';

export interface FunnelPoint {
  key: string;
  label: string;
  x: number;
  n: number;
  proportion: number;
  /** Limits at this n: 95 % and 99.8 %. */
  limits: { level: number; lower: number; upper: number; outside: 'above' | 'below' | null }[];
  /** Outside the 99.8 % limits (an outlier), or only the 95 % ones (an alert); else null. */
  flag: 'outlier' | 'alert' | null;
}

export interface Funnel {
  figure: FigureId;
  label: string;
  by: DimensionId;
  /** The unit's rate over all reviewed cases of the period: the target line. */
  p0: number;
  cases: number;
  points: FunnelPoint[];
  curve: { n: number; limits: FunnelLimit[] }[];
}

/**
 * A funnel plot of one figure by proceduralist or by nurse (Spiegelhalter 2005; exact binomial
 * limits at 95 % and 99.8 % from lib/stats `funnelPlot`), with p0 = the unit's rate for the
 * period. Cases without a proceduralist / nurse make a point of their own. The curve runs from
 * n = 1 to the largest n.
 *
 * @example
 * funnelBy(rows, 'proceduralist', apneaFigure).points.filter((p) => p.flag === 'outlier').map((p) => p.label)
 * //=> ['Dr Mateo Osei']
 */
export function funnelBy(rows: readonly StatsRow[], by: 'proceduralist' | 'nurse' | DimensionId, figure: FigureDef): Funnel {
  const groups = new Map<string, { label: string; x: number; n: number }>();
  let x = 0;
  let n = 0;
  for (const r of rows) {
    if (!hasSummary(r)) continue;
    const v = dimensionValue(r, by);
    let g = groups.get(v.key);
    if (!g) groups.set(v.key, (g = { label: v.label, x: 0, n: 0 }));
    g.n++;
    n++;
    if (figure.test(r)) {
      g.x++;
      x++;
    }
  }
  const p0 = n > 0 ? x / n : 0;
  const entries = [...groups.entries()].sort((a, b) => a[1].label.localeCompare(b[1].label));
  if (n === 0) return { figure: figure.id, label: figure.label, by, p0, cases: 0, points: [], curve: [] };
  const plot = funnelPlot(
    entries.map(([, g]) => ({ label: g.label, x: g.x, n: g.n })),
    p0,
    { curvePoints: 60, curveRange: [1, Math.max(...entries.map(([, g]) => g.n))] },
  );
  return {
    figure: figure.id,
    label: figure.label,
    by,
    p0,
    cases: n,
    points: plot.units.map((u, i) => ({
      key: entries[i][0],
      label: u.label,
      x: u.x,
      n: u.n,
      proportion: u.proportion,
      limits: u.limits,
      flag: u.limits[1]?.outside ? 'outlier' : u.limits[0]?.outside ? 'alert' : null,
    })),
    curve: plot.curve,
  };
}
