import type { StatsRow } from '@/lib/domain/statsRow';
import { findFigure, hasSummary, type FigureId } from './figures';
import { DIMENSION_LABEL, DIMENSIONS, dimensionValue, type DimensionId } from './dimensions';
import { queueReasons } from './reviewQueue';
import type { ReviewPeriod } from './period';

/**
 * Which cases a number on the review pages stands for: the cases of the period, within one
 * breakdown group, answering yes to a figure. Every number links to its case list with these as
 * query parameters (a trend point links to its own month as the period).
 */
export interface CaseFilter {
  figure?: FigureId;
  dim?: DimensionId;
  value?: string;
  /** Only cases in the review queue. */
  queue?: boolean;
}

export interface CaseFilterOptions {
  ruleIds: readonly string[];
  responseLimitS: number;
}

/** Parses filter query parameters, dropping what names nothing (e.g. an unknown dimension). */
export function parseCaseFilter(params: Record<string, string | undefined>): CaseFilter {
  const f: CaseFilter = {};
  if (params.figure && /^[a-z_]+(:[a-z0-9_]+)?$/.test(params.figure)) f.figure = params.figure;
  if (params.dim && (DIMENSIONS as readonly string[]).includes(params.dim)) {
    f.dim = params.dim as DimensionId;
    if (params.value !== undefined) f.value = params.value;
  }
  if (params.queue === '1') f.queue = true;
  return f;
}

/**
 * The rows a filter selects, in the rows' order: reviewed cases (with a summary) only, as every
 * count on the review pages counts only those. An unknown figure selects nothing.
 *
 * @example selectCases(rows, { figure: 'rule:apnea', dim: 'room', value: 'room-3' }, opts).length //=> 4
 */
export function selectCases(rows: readonly StatsRow[], filter: CaseFilter, options: CaseFilterOptions): StatsRow[] {
  const figure = filter.figure ? findFigure(filter.figure, options.ruleIds, options.responseLimitS) : undefined;
  if (filter.figure && !figure) return [];
  return rows.filter((r) => {
    if (!hasSummary(r)) return false;
    if (filter.dim && filter.value !== undefined && dimensionValue(r, filter.dim).key !== filter.value) return false;
    if (filter.queue && queueReasons(r, options).length === 0) return false;
    return figure ? figure.test(r) : true;
  });
}

/** A readable description of a filter. @example describeCaseFilter({ figure: 'rule:apnea', dim: 'room', value: 'room-3' }, opts, 'Room 3') //=> 'Cases with apnea · Room: Room 3' */
export function describeCaseFilter(filter: CaseFilter, options: CaseFilterOptions, valueLabel?: string): string {
  const parts: string[] = [];
  const figure = filter.figure ? findFigure(filter.figure, options.ruleIds, options.responseLimitS) : undefined;
  parts.push(figure ? figure.label : filter.figure ? `unknown figure "${filter.figure}"` : 'All reviewed cases');
  if (filter.dim && filter.value !== undefined) parts.push(`${DIMENSION_LABEL[filter.dim]}: ${valueLabel ?? filter.value}`);
  if (filter.queue) parts.push('in the review queue');
  return parts.join(' · ');
}

/** The period as query parameters: `month=` for a calendar month, else `from=` and `to=`. */
export function periodParams(period: Pick<ReviewPeriod, 'from' | 'to'> & { month?: string | null }): Record<string, string> {
  return period.month ? { month: period.month } : { from: period.from, to: period.to };
}

/** The case-list link for a number: `/review/cases?month=…&figure=…` (readable, not URL-escaped beyond need). */
export function casesHref(period: Pick<ReviewPeriod, 'from' | 'to'> & { month?: string | null }, filter: CaseFilter, extra: Record<string, string> = {}): string {
  const p = new URLSearchParams(periodParams(period));
  if (filter.figure) p.set('figure', filter.figure);
  if (filter.dim && filter.value !== undefined) {
    p.set('dim', filter.dim);
    p.set('value', filter.value);
  }
  if (filter.queue) p.set('queue', '1');
  for (const [k, v] of Object.entries(extra)) p.set(k, v);
  return `/review/cases?${p.toString().replace(/%3A/g, ':')}`;
}
