import type { StatsRow } from '@/lib/domain/statsRow';
import { poissonRateInterval } from '@/lib/stats';
import { proportion, type Proportion } from './proportion';
import { figureCatalogue, hasSummary, ruleIdsOf, type FigureDef, type FigureId, type SummarisedRow } from './figures';
import { apneaResponse, type ApneaResponse } from './apneaResponse';

export interface HeadlineFigure extends Proportion {
  id: FigureId;
  label: string;
  meaning: string;
  group: FigureDef['group'];
}

export interface EpisodeRate {
  ruleId: string;
  /** Episodes of the rule in the period. */
  episodes: number;
  cases: number;
  /** Episodes per 1,000 cases with the exact Poisson (Garwood) 95 % interval. */
  per1000: number | null;
  lower: number | null;
  upper: number | null;
}

export interface Headline {
  /** Sedated cases reviewed: signed cases of the period with a summary for the rule set. */
  cases: number;
  /** Signed cases of the period without a summary for the rule set (not counted anywhere). */
  withoutSummary: number;
  ruleIds: string[];
  figures: HeadlineFigure[];
  /** Episode counts per rule, as rates per 1,000 cases. */
  episodeRates: EpisodeRate[];
  apneaResponse: ApneaResponse;
}

export interface HeadlineOptions {
  /** The rule ids of the rule set, in its order; default: those found in the rows. */
  ruleIds?: readonly string[];
  /** The unit's review limit for the first response to apnea, s. */
  responseLimitS: number;
}

/** Counts the cases of `rows` answering yes to `figure`. */
export function countFigure(rows: readonly SummarisedRow[], figure: FigureDef): number {
  return countFigures(rows, [figure])[0];
}

/**
 * Counts the cases answering yes to each figure, in one pass over the rows: each case's data is
 * read once for all figures (at 100,000 cases, walking the rows once per figure costs several
 * times more in memory traffic than the tests themselves).
 */
export function countFigures(rows: readonly SummarisedRow[], figures: readonly FigureDef[]): number[] {
  const x = new Array<number>(figures.length).fill(0);
  const tests = figures.map((f) => f.test);
  for (const r of rows) for (let i = 0; i < tests.length; i++) if (tests[i](r)) x[i]++;
  return x;
}

/**
 * The headline figures of a period: every figure of the catalogue as numerator / denominator
 * (all reviewed cases), rate and Wilson 95 % interval; episode rates per rule; and the response
 * time to apnea. Rows without a summary are counted in `withoutSummary` and nowhere else.
 *
 * @example
 * reviewHeadline(rows, { responseLimitS: 60 }).figures.find((f) => f.id === 'rule:apnea')
 * //=> { id: 'rule:apnea', numerator: 14, denominator: 77, rate: 0.1818, lower: 0.1115, upper: 0.2824, … }
 */
export function reviewHeadline(rows: readonly StatsRow[], options: HeadlineOptions): Headline {
  const reviewed = rows.filter(hasSummary);
  const ruleIds = [...(options.ruleIds ?? ruleIdsOf(reviewed))];
  const n = reviewed.length;
  const catalogue = figureCatalogue(ruleIds, options.responseLimitS);
  const counts = countFigures(reviewed, catalogue);
  const figures = catalogue.map((f, i) => ({
    id: f.id,
    label: f.label,
    meaning: f.meaning,
    group: f.group,
    ...proportion(counts[i], n),
  }));
  const totals = new Array<number>(ruleIds.length).fill(0);
  for (const r of reviewed) {
    const rules = r.summary.rules;
    for (let k = 0; k < ruleIds.length; k++) totals[k] += rules[ruleIds[k]]?.episodes ?? 0;
  }
  const episodeRates = ruleIds.map((ruleId, k) => {
    const episodes = totals[k];
    const i = n > 0 ? poissonRateInterval(episodes, n, { per: 1000 }) : null;
    return { ruleId, episodes, cases: n, per1000: i ? i.estimate : null, lower: i ? i.lower : null, upper: i ? i.upper : null };
  });
  return { cases: n, withoutSummary: rows.length - n, ruleIds, figures, episodeRates, apneaResponse: apneaResponse(reviewed) };
}
