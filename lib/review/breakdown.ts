import type { StatsRow } from '@/lib/domain/statsRow';
import { proportion, type Proportion } from './proportion';
import { hasSummary, type FigureDef, type FigureId, type SummarisedRow } from './figures';
import { compareDimensionValues, dimensionValue, type DimensionId } from './dimensions';
import { countFigures } from './headline';

export interface BreakdownRow {
  key: string;
  label: string;
  /** Reviewed cases in this group. */
  cases: number;
  /** One proportion per figure, in the order asked for; the denominator is `cases`. */
  cells: Record<FigureId, Proportion>;
}

export interface Breakdown {
  dimension: DimensionId;
  figures: FigureId[];
  rows: BreakdownRow[];
  /** All reviewed cases: every row's `cases` and each figure's numerators add up to this. */
  total: BreakdownRow;
}

/**
 * A figure table broken down by one dimension. Every reviewed case falls in exactly one row
 * (missing facts make an `unknown` row), so the rows' cases and numerators sum to the total.
 *
 * @example
 * breakdown(rows, 'regimen', [apneaFigure]).rows.map((r) => [r.key, r.cases])
 * //=> [['propofol', 40], ['propofol_opioid', 25], ['benzodiazepine_opioid', 12]]
 */
export function breakdown(rows: readonly StatsRow[], dimension: DimensionId, figures: readonly FigureDef[]): Breakdown {
  const groups = new Map<string, { label: string; rows: SummarisedRow[] }>();
  const all: SummarisedRow[] = [];
  for (const r of rows) {
    if (!hasSummary(r)) continue;
    all.push(r);
    const v = dimensionValue(r, dimension);
    let g = groups.get(v.key);
    if (!g) groups.set(v.key, (g = { label: v.label, rows: [] }));
    g.rows.push(r);
  }
  const row = (key: string, label: string, members: SummarisedRow[]): BreakdownRow => {
    const cells: Record<FigureId, Proportion> = {};
    const x = countFigures(members, figures);
    figures.forEach((f, i) => (cells[f.id] = proportion(x[i], members.length)));
    return { key, label, cases: members.length, cells };
  };
  const out = [...groups.entries()].map(([key, g]) => row(key, g.label, g.rows));
  out.sort((a, b) => compareDimensionValues(dimension, a, b));
  return { dimension, figures: figures.map((f) => f.id), rows: out, total: row('total', 'All cases', all) };
}

/**
 * Several breakdowns of the same rows and figures, asking each figure of each case once
 * (the same tables as `breakdown` per dimension, faster for the review page).
 */
export function breakdowns(rows: readonly StatsRow[], dimensions: readonly DimensionId[], figures: readonly FigureDef[]): Breakdown[] {
  const reviewed = rows.filter(hasSummary);
  const hits = figures.map((f) => {
    const h = new Uint8Array(reviewed.length);
    reviewed.forEach((r, i) => (h[i] = f.test(r) ? 1 : 0));
    return h;
  });
  const row = (key: string, label: string, members: number[]): BreakdownRow => {
    const cells: Record<FigureId, Proportion> = {};
    figures.forEach((f, j) => {
      let x = 0;
      for (const i of members) x += hits[j][i];
      cells[f.id] = proportion(x, members.length);
    });
    return { key, label, cases: members.length, cells };
  };
  const all = reviewed.map((_, i) => i);
  return dimensions.map((dimension) => {
    const groups = new Map<string, { label: string; members: number[] }>();
    reviewed.forEach((r, i) => {
      const v = dimensionValue(r, dimension);
      let g = groups.get(v.key);
      if (!g) groups.set(v.key, (g = { label: v.label, members: [] }));
      g.members.push(i);
    });
    const out = [...groups.entries()].map(([key, g]) => row(key, g.label, g.members));
    out.sort((a, b) => compareDimensionValues(dimension, a, b));
    return { dimension, figures: figures.map((f) => f.id), rows: out, total: row('total', 'All cases', all) };
  });
}
