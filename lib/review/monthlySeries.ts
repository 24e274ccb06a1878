import type { StatsRow } from '@/lib/domain/statsRow';
import { pChart, specialCauses, type SpecialCauseRule } from '@/lib/stats';
import { hasSummary, type FigureDef, type FigureId } from './figures';

/** Cases of one month and how many of them answer yes to a figure. */
export interface MonthCount {
  month: string;
  x: number;
  n: number;
}

export interface SeriesPoint {
  month: string;
  x: number;
  n: number;
  /** x / n; null for a month without reviewed cases (not plotted, not in the centre line). */
  value: number | null;
  centre: number | null;
  lcl: number | null;
  ucl: number | null;
  /** Special-cause marks (lib/stats `specialCauses`): beyond 3σ, or in a run of 8 on one side. */
  rules: SpecialCauseRule[];
  /** True when the month is not complete (the period ends inside it). */
  partial: boolean;
}

export interface MonthlySeries {
  figure: FigureId;
  label: string;
  /** p̄ over the months with cases; null when there are none. */
  centre: number | null;
  points: SeriesPoint[];
}

/** Counts a figure month by month over `months` (YYYY-MM, in order); rows of other months are ignored. */
export function monthCounts(rows: readonly StatsRow[], figure: FigureDef, months: readonly string[]): MonthCount[] {
  const counts = new Map<string, MonthCount>(months.map((m) => [m, { month: m, x: 0, n: 0 }]));
  for (const r of rows) {
    if (!hasSummary(r)) continue;
    const c = counts.get(r.month);
    if (!c) continue;
    c.n++;
    if (figure.test(r)) c.x++;
  }
  return months.map((m) => counts.get(m)!);
}

/**
 * A figure month by month as a p chart from its monthly counts: x / n with limits
 * p̄ ± 3√(p̄(1 − p̄)/n_i) (lib/stats `pChart`, no revision) and special-cause marks (beyond a
 * limit; a run of 8 on one side of p̄). Months without cases stay on the axis, unplotted.
 *
 * @example
 * monthlySeriesFromCounts([{ month: '2026-06', x: 11, n: 65 }, { month: '2026-07', x: 15, n: 78 }], apnea).points[1].value
 * //=> 0.1923
 */
export function monthlySeriesFromCounts(counts: readonly MonthCount[], figure: Pick<FigureDef, 'id' | 'label'>, partialMonths: readonly string[] = []): MonthlySeries {
  const withCases = counts.filter((c) => c.n > 0);
  const chart = withCases.length ? pChart(withCases.map((c) => ({ label: c.month, x: c.x, n: c.n }))) : null;
  const marked = new Map((chart ? specialCauses(chart) : []).map((p) => [p.label, p]));
  return {
    figure: figure.id,
    label: figure.label,
    centre: chart ? chart.centre : null,
    points: counts.map((c) => {
      const p = marked.get(c.month);
      return {
        month: c.month,
        x: c.x,
        n: c.n,
        value: p ? p.value : null,
        centre: p ? p.centre : null,
        lcl: p ? p.lcl : null,
        ucl: p ? p.ucl : null,
        rules: p ? p.rules : [],
        partial: partialMonths.includes(c.month),
      };
    }),
  };
}

/**
 * The p chart of a figure over `months`, counted from rows.
 *
 * @example
 * monthlySeries(rows, apneaFigure, ['2026-06', '2026-07']).points[1]
 * //=> { month: '2026-07', x: 15, n: 78, value: 0.1923, centre: 0.1818, lcl: 0.0510, ucl: 0.3127, rules: [], partial: false }
 */
export function monthlySeries(rows: readonly StatsRow[], figure: FigureDef, months: readonly string[], partialMonths: readonly string[] = []): MonthlySeries {
  return monthlySeriesFromCounts(monthCounts(rows, figure, months), figure, partialMonths);
}
