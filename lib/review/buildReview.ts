import type { StatsRow } from '@/lib/domain/statsRow';
import type { StratumCount } from '@/lib/stats';
import { reviewHeadline, type Headline } from './headline';
import { monthCounts, monthlySeriesFromCounts, type MonthCount, type MonthlySeries } from './monthlySeries';
import { breakdowns, type Breakdown } from './breakdown';
import { funnelBy, type Funnel } from './funnel';
import { observedExpectedByRoom, strataCounts, type ObservedExpected } from './observedExpected';
import { ANY_EPISODE, findFigure, IN_REVIEW_QUEUE, MAJOR_PHYSIOLOGY, SUPPORTED_OR_ABOVE, type FigureDef, type FigureId } from './figures';
import { DIMENSIONS } from './dimensions';
import { monthEnd, trendMonths, type ReviewPeriod } from './period';

/** Figures drawn month by month on the review page, when the rule set has them. */
export const TREND_FIGURES: readonly FigureId[] = [ANY_EPISODE, 'rule:apnea', 'rule:prolonged_apnea', 'rule:hypoxemia', SUPPORTED_OR_ABOVE, MAJOR_PHYSIOLOGY];
/** Columns of the breakdown tables, when the rule set has them. */
export const BREAKDOWN_FIGURES: readonly FigureId[] = [ANY_EPISODE, 'rule:apnea', 'rule:hypoxemia', SUPPORTED_OR_ABOVE, MAJOR_PHYSIOLOGY, IN_REVIEW_QUEUE];

export interface ReviewOptions {
  period: ReviewPeriod;
  /** The period the standardised ratios compare with (e.g. the previous 6 months). */
  reference: ReviewPeriod;
  ruleIds: readonly string[];
  responseLimitS: number;
  /** The figure compared across people and rooms (funnels, O/E); default apnea, else any episode. */
  focus?: FigureId;
}

/** What the review is computed from besides the period's rows: counts, so a long trend costs no rows. */
export interface ReviewCounts {
  /** Per trend figure (`trendFigures`), its counts over `trendMonths(period)`. */
  trend: Record<FigureId, readonly MonthCount[]>;
  /** The reference period's stratum counts of the focus figure (`focusFigure`). */
  referenceStrata: readonly StratumCount[];
}

export interface Review {
  period: ReviewPeriod;
  reference: ReviewPeriod;
  focus: FigureId;
  focusLabel: string;
  headline: Headline;
  trend: { months: string[]; series: MonthlySeries[] };
  breakdowns: Breakdown[];
  breakdownFigures: { id: FigureId; label: string }[];
  funnels: { proceduralist: Funnel; nurse: Funnel };
  observedExpected: ObservedExpected;
}

/** The figures of `ids` that exist for these rules (unknown rule figures are dropped). */
export function figuresFor(ids: readonly FigureId[], ruleIds: readonly string[], responseLimitS: number): FigureDef[] {
  return ids.map((id) => findFigure(id, ruleIds, responseLimitS)).filter((f): f is FigureDef => f !== undefined);
}

/** The trend charts' figures for a rule set. */
export function trendFigures(ruleIds: readonly string[], responseLimitS: number): FigureDef[] {
  return figuresFor(TREND_FIGURES, ruleIds, responseLimitS);
}

/** The figure funnels and O/E compare on: the one asked for if it exists, else apnea, else any episode. */
export function focusFigure(focus: FigureId | undefined, ruleIds: readonly string[], responseLimitS: number): FigureDef {
  return (focus && findFigure(focus, ruleIds, responseLimitS)) || findFigure('rule:apnea', ruleIds, responseLimitS) || findFigure(ANY_EPISODE, ruleIds, responseLimitS)!;
}

/**
 * Everything the monthly review page shows: headline, monthly p charts, breakdowns by every
 * dimension, funnels by proceduralist and nurse (from the period's rows) and O/E by room
 * (the period's rows against the reference strata). `counts` carries the trend and the
 * reference as counts, so a long trend does not load a year of rows.
 *
 * @example
 * buildReview(novemberRows, counts, { period, reference, ruleIds, responseLimitS: 60 }).headline.cases //=> 77
 */
export function buildReview(rows: readonly StatsRow[], counts: ReviewCounts, options: ReviewOptions): Review {
  const { period, reference, ruleIds, responseLimitS } = options;
  const focus = focusFigure(options.focus, ruleIds, responseLimitS);
  const months = trendMonths(period);
  const lastMonth = period.to.slice(0, 7);
  const partial = period.to < monthEnd(lastMonth) ? [lastMonth] : [];
  const tableFigures = figuresFor(BREAKDOWN_FIGURES.includes(focus.id) ? BREAKDOWN_FIGURES : [...BREAKDOWN_FIGURES, focus.id], ruleIds, responseLimitS);
  return {
    period,
    reference,
    focus: focus.id,
    focusLabel: focus.label,
    headline: reviewHeadline(rows, { ruleIds, responseLimitS }),
    trend: {
      months,
      series: trendFigures(ruleIds, responseLimitS).map((f) => {
        const byMonth = new Map((counts.trend[f.id] ?? []).map((c) => [c.month, c]));
        return monthlySeriesFromCounts(months.map((m) => byMonth.get(m) ?? { month: m, x: 0, n: 0 }), f, partial);
      }),
    },
    breakdowns: breakdowns(rows, DIMENSIONS, tableFigures),
    breakdownFigures: tableFigures.map((f) => ({ id: f.id, label: f.label })),
    funnels: { proceduralist: funnelBy(rows, 'proceduralist', focus), nurse: funnelBy(rows, 'nurse', focus) },
    observedExpected: observedExpectedByRoom(rows, { strata: counts.referenceStrata }, focus),
  };
}

/**
 * The counts `buildReview` needs, from rows: `trendRows` covering the trend months and
 * `referenceRows` the reference period. For tests and small data; the app counts in SQL.
 */
export function countsFromRows(trendRows: readonly StatsRow[], referenceRows: readonly StatsRow[], options: ReviewOptions): ReviewCounts {
  const months = trendMonths(options.period);
  const trend: Record<FigureId, MonthCount[]> = {};
  for (const f of trendFigures(options.ruleIds, options.responseLimitS)) trend[f.id] = monthCounts(trendRows, f, months);
  return { trend, referenceStrata: strataCounts(referenceRows, focusFigure(options.focus, options.ruleIds, options.responseLimitS)) };
}
