import type { Rule } from '@/lib/domain/ruleSet';
import type { RuleCondition } from './conditions';
import { filterMinDuration, intervalContains, intervalContainsBefore, mergeGaps } from './intervalSet';

/** An episode's bounds before its facts are added. */
export interface EpisodeBounds {
  start: number;
  end: number;
  censoredStart: boolean;
  censoredEnd: boolean;
}

/**
 * Did the condition stop being true at `e` because coverage ended rather than because it became
 * false? `any`: some term true just before `e` is unobserved at `e`. `all`: no term is observed
 * false at `e` (so one is unobserved there).
 */
function endsUnobserved(cond: RuleCondition, e: number): boolean {
  if (cond.combine === 'any') {
    for (const term of cond.terms) {
      if (intervalContainsBefore(term.truth, e) && !intervalContains(term.covered, e)) return true;
    }
    return false;
  }
  for (const term of cond.terms) {
    if (intervalContains(term.covered, e) && !intervalContains(term.truth, e)) return false;
  }
  return true;
}

/**
 * Did the condition start being true at `s` because coverage began (the first observed instant,
 * or the first after a data gap)? Mirror image of `endsUnobserved`, looking just before `s`.
 */
function startsUnobserved(cond: RuleCondition, s: number): boolean {
  if (cond.combine === 'any') {
    for (const term of cond.terms) {
      if (intervalContains(term.truth, s) && !intervalContainsBefore(term.covered, s)) return true;
    }
    return false;
  }
  for (const term of cond.terms) {
    if (intervalContainsBefore(term.covered, s) && !intervalContainsBefore(term.truth, s)) return false;
  }
  return true;
}

/**
 * Episodes of one rule (rules.md §2): the maximal intervals of the rule's condition lasting at
 * least `minDurationS`, then, when `mergeGapS` > 0, episodes separated by less than it joined into
 * one (its start censoring from the first piece, its end censoring from the last).
 *
 * @example
 * detectEpisodes(condition, { minDurationS: 20 }) // EtCO2 < 5 mmHg from 100 s to 125 s, breathing after
 * //=> [{ start: 100, end: 125, censoredStart: false, censoredEnd: false }]
 */
export function detectEpisodes(cond: RuleCondition, rule: Pick<Rule, 'minDurationS' | 'mergeGapS'>): EpisodeBounds[] {
  const pieces = filterMinDuration(cond.truth, rule.minDurationS);
  const merged = mergeGaps(pieces, rule.mergeGapS ?? 0);
  const out: EpisodeBounds[] = [];
  for (let i = 0; i < merged.length; i += 2) {
    const start = merged[i];
    const end = merged[i + 1];
    out.push({ start, end, censoredStart: startsUnobserved(cond, start), censoredEnd: endsUnobserved(cond, end) });
  }
  return out;
}
