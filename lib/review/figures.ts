import type { StatsRow } from '@/lib/domain/statsRow';
import type { CaseLevel } from '@/lib/domain/intervention';
import { LEVEL_LABEL, ruleLabel } from '@/lib/domain/ruleLabel';
import { inReviewQueue } from './reviewQueue';

/** A StatsRow that has a summary for the rule set under review: the review counts only these. */
export type SummarisedRow = StatsRow & { summary: NonNullable<StatsRow['summary']> };

/**
 * A figure is a yes/no question asked of each case ("did it have an apnea?"); its numerator
 * is the cases answering yes. Ids are stable strings used in URLs and CSV:
 * `any_episode`, `rule:<ruleId>`, `level:<level>`, `supported_or_above`, `major_physiology`,
 * `apnea_response_over_limit`.
 */
export type FigureId = string;

export interface FigureDef {
  id: FigureId;
  label: string;
  /** What the numerator counts, in one sentence (docs/review.md says it at length). */
  meaning: string;
  group: 'case' | 'rule' | 'level';
  test: (row: SummarisedRow) => boolean;
}

export const CASE_LEVELS: readonly CaseLevel[] = ['none', 'observed', 'corrected', 'supported', 'rescued'];

export const ANY_EPISODE = 'any_episode';
export const SUPPORTED_OR_ABOVE = 'supported_or_above';
export const MAJOR_PHYSIOLOGY = 'major_physiology';
export const RESCUED = 'level:rescued';
export const PROLONGED_APNEA = 'rule:prolonged_apnea';
export const IN_REVIEW_QUEUE = 'in_review_queue';

export function hasSummary(row: StatsRow): row is SummarisedRow {
  return row.summary !== null;
}

/** Rule ids seen in the rows' summaries, in first-seen order (the rule set's order). */
export function ruleIdsOf(rows: readonly StatsRow[]): string[] {
  const seen = new Set<string>();
  for (const r of rows) if (r.summary) for (const id of Object.keys(r.summary.rules)) seen.add(id);
  return [...seen];
}

const lowerFirst = (s: string) => (/^[A-Z][a-z]/.test(s) ? s.charAt(0).toLowerCase() + s.slice(1) : s);

function ruleFigure(ruleId: string): FigureDef {
  return {
    id: `rule:${ruleId}`,
    label: `Cases with ${lowerFirst(ruleLabel(ruleId))}`,
    meaning: `Cases with at least one episode of the rule "${ruleId}".`,
    group: 'rule',
    test: (r) => (r.summary.rules[ruleId]?.episodes ?? 0) > 0,
  };
}

function levelFigure(level: CaseLevel): FigureDef {
  return {
    id: `level:${level}`,
    label: `Case level: ${lowerFirst(LEVEL_LABEL[level])}`,
    meaning: `Cases whose case level (the highest level of any intervention recorded, rules.md §6) is "${level}".`,
    group: 'level',
    test: (r) => r.summary.caseLevel === level,
  };
}

/**
 * Every figure the review can show for a rule set with these rule ids, in display order.
 * `responseLimitS` is the unit's review limit for the first response to apnea.
 *
 * @example
 * figureCatalogue(['apnea', 'hypoxemia'], 60).map((f) => f.id)
 * //=> ['any_episode', 'supported_or_above', 'major_physiology', 'apnea_response_over_limit', 'in_review_queue',
 * //    'rule:apnea', 'rule:hypoxemia', 'level:none', 'level:observed', 'level:corrected', 'level:supported', 'level:rescued']
 */
export function figureCatalogue(ruleIds: readonly string[], responseLimitS: number): FigureDef[] {
  return [
    { id: ANY_EPISODE, label: 'Cases with any respiratory episode', meaning: 'Cases with at least one episode of any rule of the rule set.', group: 'case', test: (r) => r.summary.episodeCount > 0 },
    {
      id: SUPPORTED_OR_ABOVE,
      label: 'Cases needing support or rescue',
      meaning: 'Cases at level supported or rescued: bag-mask or other positive-pressure ventilation, a supraglottic airway, a reversal agent, the procedure stopped early, or rescue.',
      group: 'case',
      test: (r) => r.summary.caseLevel === 'supported' || r.summary.caseLevel === 'rescued',
    },
    { id: MAJOR_PHYSIOLOGY, label: 'Cases with major physiology', meaning: 'Cases flagged majorPhysiology: an episode of a rule marked major (prolonged apnea, prolonged or critical hypoxemia in plateau-default).', group: 'case', test: (r) => r.summary.majorPhysiology },
    {
      id: 'apnea_response_over_limit',
      label: `First response to apnea later than ${responseLimitS} s`,
      meaning: `Cases whose first response to their first apnea came more than ${responseLimitS} s after the apnea began (the unit's review limit).`,
      group: 'case',
      test: (r) => r.summary.firstApneaResponseS !== null && r.summary.firstApneaResponseS > responseLimitS,
    },
    {
      id: IN_REVIEW_QUEUE,
      label: 'Cases in the review queue',
      meaning: `Cases at level supported or above, with major physiology, or with a first response to apnea later than ${responseLimitS} s.`,
      group: 'case',
      test: (r) => inReviewQueue(r, { responseLimitS }),
    },
    ...ruleIds.map(ruleFigure),
    ...CASE_LEVELS.map(levelFigure),
  ];
}

/** The definition of one figure id, or undefined when the id names nothing for these rules. */
export function findFigure(id: FigureId, ruleIds: readonly string[], responseLimitS: number): FigureDef | undefined {
  if (id.startsWith('rule:')) return ruleIds.includes(id.slice(5)) ? ruleFigure(id.slice(5)) : undefined;
  return figureCatalogue([], responseLimitS).find((f) => f.id === id);
}
