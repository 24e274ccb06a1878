import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { Channel, SampleSource, SampleUnit } from '@/lib/domain/channel';
import type { DoseUnit, DrugClass } from '@/lib/domain/drug';
import type { Analysis, SedationTime, Skipped } from '@/lib/domain/episode';
import type { CaseLevel, InterventionKind, Level } from '@/lib/domain/intervention';
import type { RuleSetRef } from '@/lib/domain/ruleSet';

/**
 * The case note (issue 4): a structured, typed record of one sedation case plus its plain-text
 * rendering. Every time is kept twice — `t` in seconds from `case.start` (the engine's clock) and
 * `clock`, the wall-clock time in the unit's zone — and every number the text shows is a field
 * here, formatted by one function per quantity (`lib/note/format.ts`).
 */

export type Sex = 'female' | 'male' | 'other' | 'unknown';
export type DepthId = 'minimal' | 'moderate' | 'deep' | 'general';
export type AsaClassId = 'I' | 'II' | 'III' | 'IV' | 'V' | 'VI';
export type StopBangBand = 'low' | 'intermediate' | 'high';
export type AldreteItem = 'activity' | 'respiration' | 'circulation' | 'consciousness' | 'oxygenation';
export type SignatureKind = 'signed' | 'amended' | 'cosigned';

/** One recovery (modified Aldrete) score as the database holds it; `t` in seconds from case start. */
export interface RecoveryScoreFact {
  t: number;
  total: number;
  items?: Partial<Record<AldreteItem, number>>;
}

export interface SignatureFact {
  by: string;
  role: string;
  /** ISO 8601 UTC instant. */
  at: string;
  kind: SignatureKind;
  /** Why an amendment was made (required in practice for `amended`). */
  reason?: string;
}

/**
 * What the database holds beside the CaseRecord. STOP-Bang and Aldrete totals are given numbers
 * (computed elsewhere); this module only reports them.
 */
export interface NoteFacts {
  unitName: string;
  patient: {
    name: string;
    mrn: string;
    /** YYYY-MM-DD. */
    birthDate: string | null;
    ageYears: number | null;
    sex: Sex | null;
  };
  procedureLabel: string | null;
  proceduralist: string | null;
  nurse: string | null;
  room: string | null;
  plannedDepth: DepthId | null;
  reachedDepth: DepthId | null;
  asaClass: AsaClassId | null;
  asaEmergency: boolean;
  /** When absent, `record.case.weightKg` / `heightCm` are used; BMI is computed when absent. */
  weightKg?: number | null;
  heightCm?: number | null;
  bmi?: number | null;
  stopBang: { score: number; band: StopBangBand } | null;
  /** E.g. "Mallampati II". */
  airwayClass: string | null;
  /** Label and class of each drug name used in `record.doses[].drug`. */
  drugs: Record<string, { label: string; drugClass: DrugClass }>;
  recoveryScores: RecoveryScoreFact[];
  /** Seconds from case start; when absent the first `discharge` event of the record is used. */
  dischargeT?: number | null;
  /** The nurse's free text, shown verbatim. */
  freeText: string | null;
  signatures: SignatureFact[];
  /** Note version: 1 for the first signed note, +1 per amendment. */
  version: number;
}

export interface NoteInput {
  record: CaseRecord;
  analysis: Analysis;
  facts: NoteFacts;
  /** IANA zone of the unit, e.g. "Europe/Dublin". */
  timeZone: string;
  /** Longest time one monitor sample holds (the engine's maxHold); default 30 s. Gaps longer than this are listed. */
  maxHoldS?: number;
}

/** An instant of the case: seconds from case start and the clock time (HH:MM:SS) in the unit's zone. */
export interface TimePoint {
  t: number;
  clock: string;
}

export interface TimedValue {
  value: number;
  unit: SampleUnit;
  at: TimePoint;
}

export interface PatientAndRisk {
  name: string;
  mrn: string;
  birthDate: string | null;
  ageYears: number | null;
  sex: Sex | null;
  asa: { class: AsaClassId; emergency: boolean; label: string; meaning: string } | null;
  weightKg: number | null;
  heightCm: number | null;
  bmi: number | null;
  stopBang: { score: number; band: StopBangBand } | null;
  airwayClass: string | null;
}

export interface ProcedureSection {
  label: string | null;
  /** Case date in the unit's zone, e.g. "2 Mar 2026". */
  date: string;
  room: string | null;
  proceduralist: string | null;
  nurse: string | null;
  plannedDepth: { id: DepthId; label: string } | null;
  reachedDepth: { id: DepthId; label: string } | null;
}

export interface TimesSection {
  caseStart: TimePoint;
  sedationStart: TimePoint | null;
  procedureStart: TimePoint | null;
  procedureEnd: TimePoint | null;
  recoveryStart: TimePoint | null;
  sedationEnd: TimePoint | null;
  discharge: TimePoint | null;
  /** The engine's sedation time (docs/rules.md): what coverage and gaps are measured over. */
  sedation: { start: TimePoint; end: TimePoint; durationS: number; startFrom: SedationTime['startFrom']; endFrom: SedationTime['endFrom'] } | null;
}

export interface DoseLine {
  at: TimePoint;
  drug: string;
  label: string;
  drugClass: DrugClass;
  amount: number;
  unit: DoseUnit;
  route: string;
}

export type PerKgUnit = 'mg/kg' | 'mcg/kg';

export interface DrugTotal {
  drug: string;
  label: string;
  drugClass: DrugClass;
  doseCount: number;
  total: number;
  unit: DoseUnit;
  /** Total per kg of body weight (mass units only, and only with a weight); null otherwise. */
  perKg: { value: number; unit: PerKgUnit } | null;
}

export interface DrugsSection {
  doses: DoseLine[];
  totals: DrugTotal[];
  /** The weight per-kg figures are based on (kg), null when none was recorded. */
  weightKg: number | null;
}

export interface ChannelUse {
  channel: Channel;
  source: SampleSource;
  unit: SampleUnit;
  samples: number;
  /** Median interval between samples (s); null for a single sample. */
  intervalS: number | null;
  first: TimePoint;
  last: TimePoint;
}

export interface DataGap {
  channel: 'etco2' | 'spo2';
  /** Last observed sample before the gap (or the sedation start). */
  start: TimePoint;
  /** Next observed sample after the gap (or the sedation end). */
  end: TimePoint;
  durationS: number;
}

export interface MonitoringSection {
  channels: ChannelUse[];
  /** Share of the sedation time covered by EtCO2 monitor samples (0–100, one decimal); null without a sedation time. */
  capnographyCoveragePct: number | null;
  maxHoldS: number;
  /** EtCO2 / SpO2 monitor gaps longer than maxHold inside the sedation time. */
  gaps: DataGap[];
  /** EtCO2 / SpO2 with no monitor series at all. */
  notMonitored: ('etco2' | 'spo2')[];
}

export interface PhysiologySection {
  etco2Unit: 'mmHg' | 'kPa';
  baseline: { etco2: number | null; spo2: number | null; rr: number | null };
  lowestSpo2: TimedValue | null;
  highestEtco2: TimedValue | null;
  lowestEtco2: TimedValue | null;
  lowestRr: TimedValue | null;
}

export interface EpisodeExtremeLine {
  channel: Channel;
  kind: 'lowest' | 'highest';
  value: number;
  unit: SampleUnit;
  at: TimePoint;
}

export interface InterventionLine {
  at: TimePoint;
  kind: InterventionKind;
  label: string;
  level: Level;
  note?: string;
}

export interface EpisodeLine {
  /** 1-based, in episode order (start, then rule id). */
  n: number;
  rule: string;
  label: string;
  start: TimePoint;
  end: TimePoint;
  durationS: number;
  censored: boolean;
  censoredAt: 'start' | 'end' | 'both' | null;
  extremes: EpisodeExtremeLine[];
  lastSedativeDose: { at: TimePoint; drug: string; label: string; amount: number; unit: DoseUnit; sinceS: number } | null;
  interventions: InterventionLine[];
  /** First linked intervention − start (s); null when none. */
  responseS: number | null;
  level: Level;
  /** Apnea-type rules: EtCO2 fell from ≥ 25 to < 5 mmHg within 5 s at onset; null for other rules. */
  onsetAbrupt: boolean | null;
  /** Set for an apnea with an abrupt onset (rules.md §5). */
  abruptOnsetHint: string | null;
}

export interface SpotFindingLine {
  rule: string;
  label: string;
  channel: Channel;
  value: number;
  unit: SampleUnit;
  at: TimePoint;
}

export interface CaseLevelSection {
  level: CaseLevel;
  label: string;
  meaning: string;
  majorPhysiology: boolean;
  /** The request to confirm the interventions, when majorPhysiology; else null. */
  confirmRequest: string | null;
  coSignatureNeeded: boolean;
}

export interface RecoveryLine {
  at: TimePoint;
  total: number;
  items: Partial<Record<AldreteItem, number>>;
}

export interface RecoverySection {
  scores: RecoveryLine[];
  discharge: TimePoint | null;
}

export interface SignatureLine {
  by: string;
  role: string;
  at: string;
  /** Date and clock time in the unit's zone, e.g. "2 Mar 2026 09:52". */
  atLocal: string;
  kind: SignatureKind;
  reason: string | null;
}

export interface ResuscitationSection {
  rules: RuleSetRef;
  compressionS: number;
  periods: { start: TimePoint; end: TimePoint | null; endedBy: string | null }[];
  /** Per-minute median EtCO2 during compressions, in the case's display unit. */
  minutes: { minute: number; median: number | null; unit: 'mmHg' | 'kPa'; band: string }[];
  fatigueFlags: { at: TimePoint; minute: number }[];
  possibleRoscFlags: { at: TimePoint }[];
  timeline: { at: TimePoint; label: string; note?: string }[];
}

export interface CaseNote {
  format: 'plateau-note/1';
  version: number;
  unitName: string;
  timeZone: string;
  /** ISO instant of case start (t = 0). */
  caseStartIso: string;
  patientAndRisk: PatientAndRisk;
  procedure: ProcedureSection;
  times: TimesSection;
  drugs: DrugsSection;
  monitoring: MonitoringSection;
  physiology: PhysiologySection;
  episodes: EpisodeLine[];
  spotFindings: SpotFindingLine[];
  /** Rules or terms the engine did not evaluate (a missing baseline). */
  skipped: Skipped[];
  /** Every intervention recorded in the case, linked to an episode or not. */
  interventions: InterventionLine[];
  caseLevel: CaseLevelSection;
  recovery: RecoverySection;
  /** Present when chest compressions were recorded: its own section with the timeline. */
  resuscitation: ResuscitationSection | null;
  freeText: string | null;
  signatures: SignatureLine[];
  ruleSet: RuleSetRef;
  caution: string;
  /** The whole note as plain text, one line per fact. */
  text: string;
}

/** One point series for the chart; `v[i]` null where the sample is unobserved (probe off, gap marker). */
export interface ChartSeries {
  channel: 'etco2' | 'rr' | 'spo2' | 'hr';
  unit: SampleUnit;
  t: number[];
  v: (number | null)[];
}

/**
 * What the trend chart of the PDF draws. Times in seconds from case start; EtCO2 in `etco2Unit`.
 * `window` is the span drawn (usually the sedation time); the whole series range when absent.
 */
export interface ChartData {
  window?: { start: number; end: number };
  etco2Unit: 'mmHg' | 'kPa';
  /** Samples further apart than this are not joined by a line (default 30 s). */
  maxHoldS?: number;
  series: ChartSeries[];
  episodes: { rule: string; label: string; start: number; end: number }[];
  doses: { t: number; label: string }[];
}
