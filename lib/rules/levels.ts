import type { Episode } from '@/lib/domain/episode';
import { INTERVENTION_LEVEL, levelRank, type CaseLevel, type InterventionKind, type Level } from '@/lib/domain/intervention';
import type { RuleSet } from '@/lib/domain/ruleSet';

/**
 * An episode's level (rules.md §6): the highest level among its linked interventions,
 * `observed` when none.
 *
 * @example
 * episodeLevel([{ kind: 'jaw_thrust' }, { kind: 'bag_mask' }])
 * //=> 'supported'
 */
export function episodeLevel(interventions: readonly { kind: InterventionKind }[]): Level {
  let level: Level = 'observed';
  for (const iv of interventions) {
    const l = INTERVENTION_LEVEL[iv.kind];
    if (levelRank(l) > levelRank(level)) level = l;
  }
  return level;
}

/**
 * The case's level (rules.md §6): the highest level of all interventions recorded in the case,
 * `observed` when none, `none` when the case has no episode and no intervention. (Spot findings
 * alone leave a case at `none`.)
 *
 * @example
 * caseLevel([], [])
 * //=> 'none'
 */
export function caseLevel(episodes: readonly unknown[], interventions: readonly { kind: InterventionKind }[]): CaseLevel {
  if (episodes.length === 0 && interventions.length === 0) return 'none';
  return episodeLevel(interventions);
}

/**
 * `majorPhysiology` (rules.md §6): the case has an episode of a rule marked `major`
 * (in plateau-default: prolonged_apnea, prolonged_hypoxemia, critical_hypoxemia).
 *
 * @example
 * majorPhysiology([{ rule: 'prolonged_apnea' }], plateauDefault)
 * //=> true
 */
export function majorPhysiology(episodes: readonly Pick<Episode, 'rule'>[], ruleSet: RuleSet): boolean {
  const major = new Set(ruleSet.rules.filter((r) => r.major === true).map((r) => r.id));
  return episodes.some((e) => major.has(e.rule));
}
