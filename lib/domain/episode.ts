import type { Channel, SampleUnit } from './channel';
import type { DoseUnit } from './drug';
import type { CaseLevel, InterventionKind, Level } from './intervention';
import type { RuleSetRef } from './ruleSet';

/**
 * Results of the rules engine (rules.md §5–§7). Times are seconds from case start. Every EtCO2
 * (and inspired CO2) value is in the case's display unit (`case.etco2Unit`) and sits beside its
 * `unit`; thresholds and baselines are applied in mmHg inside the engine.
 */

/** Baselines of rules.md §3; `null` when no window held 3 monitor samples. */
export interface Baseline {
  etco2: number | null;
  spo2: number | null;
  rr: number | null;
  /** Unit of `etco2` (the case's display unit). */
  etco2Unit: 'mmHg' | 'kPa';
}

/** The extreme value of one of the rule's channels inside an episode. */
export interface EpisodeExtreme {
  channel: Channel;
  /** `lowest` for rules that look below a threshold (`<`, `<=`, `=`), `highest` for `>=`, `>`. */
  kind: 'lowest' | 'highest';
  value: number;
  unit: SampleUnit;
  t: number;
}

export interface LinkedDose {
  t: number;
  drug: string;
  amount: number;
  unit: DoseUnit;
  route: string;
}

export interface LinkedIntervention {
  t: number;
  kind: InterventionKind;
  level: Level;
}

export interface Episode {
  rule: string;
  /** First instant the rule's condition is true. */
  start: number;
  /** First instant it is no longer true (half-open: the episode is [start, end)). */
  end: number;
  durationS: number;
  /** True when the episode starts at the first observed instant or ends because coverage ends. */
  censored: boolean;
  censoredAt: 'start' | 'end' | 'both' | null;
  /** One entry per channel of the rule that has observed samples inside the episode. */
  extremes: EpisodeExtreme[];
  /**
   * For apnea-type rules (an absolute EtCO2 `<`/`<=` term at ≤ 5 mmHg): EtCO2 fell from
   * ≥ 25 mmHg to < 5 mmHg within 5 s at onset. `null` for other rules.
   */
  onsetAbrupt: boolean | null;
  /** Last sedative or opioid dose strictly before `start`. */
  lastSedativeDose: LinkedDose | null;
  sinceLastSedativeDoseS: number | null;
  /** Interventions recorded in [start, end + 60 s]. */
  interventions: LinkedIntervention[];
  /** First linked intervention time − start; null if none. */
  responseS: number | null;
  /** Highest level among the linked interventions; `observed` if none. */
  level: Level;
}

/** A manual (spot) reading past a rule's threshold (rules.md §1). */
export interface SpotFinding {
  rule: string;
  channel: Channel;
  t: number;
  value: number;
  unit: SampleUnit;
}

/** A baseline-relative term or a whole rule not evaluated because its baseline is null (§3). */
export interface Skipped {
  rule: string;
  reason: string;
  /** `term`: only the term at index `term` was dropped (OR rule); `rule`: the rule did not run. */
  dropped: 'term' | 'rule';
  term?: number;
}

export interface ExtremeValue {
  value: number;
  t: number;
}

export interface RuleSummary {
  rule: string;
  episodeCount: number;
  totalDurationS: number;
}

/**
 * Where the sedation time used for capnography coverage starts and ends (docs/rules.md):
 * start = first `sedation_start` event, else the first sedative dose; end = first
 * `sedation_end` after start, else `recovery_start`, else `procedure_end`, else the end of the
 * last monitor sample's coverage.
 */
export interface SedationTime {
  start: number;
  end: number;
  startFrom: 'sedation_start' | 'first_sedative_dose';
  endFrom: 'sedation_end' | 'recovery_start' | 'procedure_end' | 'end_of_monitoring';
}

/** The per-case summary stored with the rule-set version (one row per case per version). */
export interface CaseSummary {
  ruleSet: RuleSetRef;
  /** One entry per rule of the set, in the rule set's order (zero counts included). */
  rules: RuleSummary[];
  episodeCount: number;
  /** Over observed monitor and manual SpO2 readings (probe off and 0 excluded). */
  lowestSpo2: ExtremeValue | null;
  highestEtco2: ExtremeValue | null;
  lowestEtco2: ExtremeValue | null;
  /** Unit of the EtCO2 values (the case's display unit). */
  etco2Unit: 'mmHg' | 'kPa';
  lowestRr: ExtremeValue | null;
  sedationTime: SedationTime | null;
  /** Share of the sedation time covered by EtCO2 monitor samples, 0–100 (one decimal); null without a sedation time. */
  capnographyCoveragePct: number | null;
  caseLevel: CaseLevel;
  majorPhysiology: boolean;
  /** `responseS` of each episode of the rule `apnea`, in episode order. */
  apneaResponseTimesS: (number | null)[];
}

/** The output of `analyzeCase` and of `npm run analyze` (rules.md §7), exactly these keys. */
export interface Analysis {
  ruleSet: RuleSetRef;
  baseline: Baseline;
  episodes: Episode[];
  spotFindings: SpotFinding[];
  skipped: Skipped[];
  caseLevel: CaseLevel;
  summary: CaseSummary;
}

/** An analysis before its summary is attached; what `summarizeCase` needs. */
export type AnalysisCore = Omit<Analysis, 'summary'>;
