/**
 * Plateau's rules library (rules.md): pure functions from a CaseRecord and a rule set to
 * episodes, spot findings, levels and a per-case summary. Start at `analyzeCase`.
 */
export { analyzeCase, compareEpisodes, type AnalyzeOptions } from './analyze';
export { summarizeCase, sedationTime, APNEA_RULE_ID, type SummarizeCaseOptions } from './summarizeCase';
export {
  compareRuleSets,
  compareAnalyses,
  COMPARED_EPISODE_FIELDS,
  type RuleSetComparison,
  type RuleComparison,
  type EpisodeChange,
  type ComparedEpisodeField,
} from './compareRuleSets';
export {
  PLATEAU_DEFAULT_V1,
  DEITCH_2010_V1,
  CONWAY_2019_V1,
  MASON_2012_V1,
  HART_1997_V1,
  BURTON_2006_V1,
  DEFAULT_RULE_SET_ID,
  listBuiltInRuleSets,
  getBuiltInRuleSet,
  findRule,
} from './ruleSets';
export { episodeLevel, caseLevel, majorPhysiology } from './levels';
export { computeBaseline, channelBaseline, firstSedativeDoseTime, BASELINE_WINDOW_S, BASELINE_MIN_SAMPLES, type EngineBaseline } from './baseline';
export {
  coverSeries,
  coverCase,
  coverEndAt,
  isObserved,
  medianInterval,
  engineUnit,
  DEFAULT_MAX_HOLD_S,
  type ChannelTrace,
  type TraceMap,
  type CoverageOptions,
} from './coverage';
export {
  compareValue,
  effectiveThreshold,
  termTruth,
  resolveRule,
  ConditionCache,
  type ResolvedRule,
  type ResolvedTerm,
  type RuleCondition,
  type TermCondition,
} from './conditions';
export { detectEpisodes, type EpisodeBounds } from './detectEpisodes';
export { episodeFacts, episodeContext, isApneaTypeRule, RESPONSE_WINDOW_S, ABRUPT_FROM_MMHG, ABRUPT_TO_MMHG, ABRUPT_WITHIN_S, type EpisodeContext } from './episodeFacts';
export { findSpotFindings } from './spotFindings';
export { displayValue, sampleDisplayValue, type Co2DisplayUnit } from './displayValue';
export {
  intervalSetFromPairs,
  intervalSetToPairs,
  intervalUnion,
  intervalIntersection,
  intervalDifference,
  filterMinDuration,
  mergeGaps,
  intervalTotal,
  intervalContains,
  intervalContainsBefore,
  intervalClip,
  DURATION_TOLERANCE_S,
  type IntervalSet,
} from './intervalSet';
export type { RuleSet, Rule, RuleTerm, RuleSetRef, Comparator, Combine, RelativeKind } from '@/lib/domain/ruleSet';
export type { Analysis, AnalysisCore, Baseline, Episode, EpisodeExtreme, SpotFinding, Skipped, CaseSummary, RuleSummary, SedationTime, ExtremeValue } from '@/lib/domain/episode';
