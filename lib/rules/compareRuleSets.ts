import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { Analysis, Episode } from '@/lib/domain/episode';
import type { CaseLevel } from '@/lib/domain/intervention';
import type { RuleSet, RuleSetRef } from '@/lib/domain/ruleSet';
import { analyzeCase, type AnalyzeOptions } from './analyze';

/** Episode fields compared between two matched episodes. */
export const COMPARED_EPISODE_FIELDS = ['start', 'end', 'censored', 'level', 'responseS'] as const;
export type ComparedEpisodeField = (typeof COMPARED_EPISODE_FIELDS)[number];

export interface EpisodeChange {
  before: Episode;
  after: Episode;
  /** The compared fields that differ. */
  fields: ComparedEpisodeField[];
}

export interface RuleComparison {
  rule: string;
  /** Whether each rule set has a rule of this id. */
  inA: boolean;
  inB: boolean;
  /** `same`: every episode matched unchanged. */
  status: 'same' | 'different';
  /** Episodes in B with no overlapping episode in A. */
  appeared: Episode[];
  /** Episodes in A with no overlapping episode in B. */
  vanished: Episode[];
  /** Overlapping episodes whose compared fields differ. */
  changed: EpisodeChange[];
  /** Number of overlapping episodes with the same compared fields. */
  unchanged: number;
}

export interface RuleSetComparison {
  a: RuleSetRef;
  b: RuleSetRef;
  /** Rules of A in A's order, then rules only in B. */
  rules: RuleComparison[];
  caseLevel: { a: CaseLevel; b: CaseLevel };
  majorPhysiology: { a: boolean; b: boolean };
}

function overlaps(x: Episode, y: Episode): boolean {
  return x.start < y.end && y.start < x.end;
}

function compareRule(rule: string, inA: boolean, inB: boolean, as: Episode[], bs: Episode[]): RuleComparison {
  const matched = new Array<boolean>(bs.length).fill(false);
  const vanished: Episode[] = [];
  const changed: EpisodeChange[] = [];
  let unchanged = 0;
  for (const x of as) {
    const j = bs.findIndex((y, k) => !matched[k] && overlaps(x, y));
    if (j < 0) {
      vanished.push(x);
      continue;
    }
    matched[j] = true;
    const fields = COMPARED_EPISODE_FIELDS.filter((f) => x[f] !== bs[j][f]);
    if (fields.length === 0) unchanged += 1;
    else changed.push({ before: x, after: bs[j], fields });
  }
  const appeared = bs.filter((_, k) => !matched[k]);
  const same = appeared.length === 0 && vanished.length === 0 && changed.length === 0;
  return { rule, inA, inB, status: same ? 'same' : 'different', appeared, vanished, changed, unchanged };
}

/**
 * Compare two analyses of the same case rule by rule: episodes of a rule are matched when they
 * overlap in time; unmatched ones appeared (only in B) or vanished (only in A); matched ones with
 * a different start, end, censoring, level or response time changed.
 *
 * @example
 * compareAnalyses(analysisV1, analysisV2).rules.find((r) => r.rule === 'apnea')?.status
 * //=> 'same'
 */
export function compareAnalyses(a: Analysis, b: Analysis): RuleSetComparison {
  // the summary lists every rule of the set, in order, episodes or not
  const idsA = a.summary.rules.map((r) => r.rule);
  const idsB = b.summary.rules.map((r) => r.rule);
  const all = [...idsA, ...idsB.filter((id) => !idsA.includes(id))];
  return {
    a: a.ruleSet,
    b: b.ruleSet,
    rules: all.map((id) =>
      compareRule(
        id,
        idsA.includes(id),
        idsB.includes(id),
        a.episodes.filter((e) => e.rule === id),
        b.episodes.filter((e) => e.rule === id),
      ),
    ),
    caseLevel: { a: a.caseLevel, b: b.caseLevel },
    majorPhysiology: { a: a.summary.majorPhysiology, b: b.summary.majorPhysiology },
  };
}

/**
 * Run two rule sets (or two versions of one) on one case and report, per rule, the episodes
 * that appeared, vanished or changed.
 *
 * @example
 * compareRuleSets(record, PLATEAU_DEFAULT_V1, MASON_2012_V1).rules.map((r) => [r.rule, r.inA, r.inB]).slice(0, 2)
 * //=> [['apnea', true, true], ['prolonged_apnea', true, true]]
 */
export function compareRuleSets(record: CaseRecord, a: RuleSet, b: RuleSet, options?: AnalyzeOptions): RuleSetComparison {
  return compareAnalyses(analyzeCase(record, a, options), analyzeCase(record, b, options));
}
