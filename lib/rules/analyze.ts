import type { Channel } from '@/lib/domain/channel';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { Analysis, AnalysisCore, Baseline, Episode, Skipped } from '@/lib/domain/episode';
import type { RuleSet } from '@/lib/domain/ruleSet';
import { computeBaseline } from './baseline';
import { ConditionCache, resolveRule } from './conditions';
import { coverCase, type CoverageOptions } from './coverage';
import { detectEpisodes } from './detectEpisodes';
import { displayValue } from './displayValue';
import { episodeContext, episodeFacts, RESPONSE_WINDOW_S } from './episodeFacts';
import { caseLevel } from './levels';
import { findSpotFindings } from './spotFindings';
import { summarizeWithTraces } from './summarizeCase';

export interface AnalyzeOptions extends CoverageOptions {
  /** Interventions up to this long after an episode's end are linked to it; default 60 s (rules.md §5). */
  responseWindowS?: number;
}

const SUMMARY_CHANNELS: readonly Channel[] = ['etco2', 'spo2', 'rr'];

/**
 * Order of episodes in a result: by start, then rule id (rules.md §7).
 *
 * @example
 * [{ start: 10, rule: 'hypoxemia' }, { start: 10, rule: 'apnea' }].sort(compareEpisodes).map((e) => e.rule)
 * //=> ['apnea', 'hypoxemia']
 */
export function compareEpisodes(a: Pick<Episode, 'start' | 'rule'>, b: Pick<Episode, 'start' | 'rule'>): number {
  return a.start - b.start || (a.rule < b.rule ? -1 : a.rule > b.rule ? 1 : 0);
}

/**
 * Analyse one case with one rule set: the §7 result of rules.md — rule set id and version,
 * baselines, episodes (sorted by start, then rule id) with their facts and levels, spot findings,
 * skipped terms and rules, the case level and the per-case summary. Pure; assumes a validated
 * CaseRecord (see `parseCaseFile`) and a valid rule set (`ruleSetSchema`).
 *
 * @example
 * analyzeCase(record, getBuiltInRuleSet('plateau-default')!).episodes.map((e) => [e.rule, e.start, e.end])
 * //=> [['apnea', 600, 640], ['hypoxemia', 630, 690]]
 */
export function analyzeCase(record: CaseRecord, ruleSet: RuleSet, options?: AnalyzeOptions): Analysis {
  // cover only what is used: the rules' channels and the summary's (EtCO2, SpO2, RR)
  const channels = new Set<Channel>(SUMMARY_CHANNELS);
  for (const rule of ruleSet.rules) for (const term of rule.terms) channels.add(term.channel);
  const traces = coverCase(record, options, channels);
  const baseline = computeBaseline(record, traces);
  const cache = new ConditionCache(traces);
  const ctx = episodeContext(record, traces, options?.responseWindowS ?? RESPONSE_WINDOW_S);
  const resolved = ruleSet.rules.map((rule) => resolveRule(rule, baseline));

  const episodes: Episode[] = [];
  const skipped: Skipped[] = [];
  for (const r of resolved) {
    for (const s of r.skipped) skipped.push(s);
    if (!r.runs) continue;
    for (const bounds of detectEpisodes(cache.rule(r), r.rule)) episodes.push(episodeFacts(bounds, r, ctx));
  }
  episodes.sort(compareEpisodes);

  const co2Unit = record.case.etco2Unit;
  const shown: Baseline = {
    etco2: baseline.etco2 === null ? null : displayValue('etco2', baseline.etco2, co2Unit).value,
    spo2: baseline.spo2,
    rr: baseline.rr,
    etco2Unit: co2Unit,
  };
  const core: AnalysisCore = {
    ruleSet: { id: ruleSet.id, version: ruleSet.version },
    baseline: shown,
    episodes,
    spotFindings: findSpotFindings(record.series, resolved, cache, co2Unit),
    skipped,
    caseLevel: caseLevel(episodes, record.interventions),
  };
  return { ...core, summary: summarizeWithTraces(record, ruleSet, core, traces) };
}
