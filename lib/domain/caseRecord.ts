import type { Channel, SampleSource, SampleUnit } from './channel';
import type { DoseUnit, DrugClass } from './drug';
import type { InterventionKind } from './intervention';

/**
 * The one shape of a case that flows from the database, the `plateau-case/1` file and imports
 * into the engine (architecture.md). Times in series, doses, interventions and events are
 * seconds from `case.start`.
 */
export interface CaseRecord {
  case: CaseFacts;
  series: SampleSeries[];
  doses: DoseEntry[];
  interventions: InterventionEntry[];
  events: CaseEventEntry[];
  /** A rule-set id (built-in or saved) or a whole rule-set object; engine default when absent. */
  ruleSet?: unknown;
}

export interface CaseFacts {
  /** ISO 8601 UTC instant the engine counts seconds from. */
  start: string;
  weightKg?: number | null;
  heightCm?: number | null;
  /** Display unit for EtCO2 in reports; the engine works in mmHg. */
  etco2Unit: 'mmHg' | 'kPa';
  // Facts below are optional in the case file and filled from the database.
  ageYears?: number | null;
  sex?: 'female' | 'male' | 'other' | 'unknown' | null;
  asaClass?: string | null;
  plannedDepth?: 'minimal' | 'moderate' | 'deep' | 'general' | null;
  procedure?: string | null;
}

export interface SampleSeries {
  channel: Channel;
  unit: SampleUnit;
  source: SampleSource;
  t: number[];
  v: number[];
  /** Optional per-sample flag (SpO2 only): true where the probe was off. */
  probeOff?: boolean[];
}

export interface DoseEntry {
  t: number;
  drug: string;
  amount: number;
  unit: DoseUnit;
  route: string;
  drugClass?: DrugClass;
}

export interface InterventionEntry {
  t: number;
  kind: InterventionKind;
  note?: string;
}

export const CASE_EVENT_KINDS = [
  'sedation_start',
  'procedure_start',
  'procedure_end',
  'recovery_start',
  'discharge',
  'sedation_end',
  // Resuscitation entries (the view that chest_compressions opens); compressions themselves start
  // with the `chest_compressions` intervention.
  'compressions_paused',
  'compressions_resumed',
  'compressions_stopped',
  'rhythm_check',
  'shock',
  'airway_placed',
  'rosc',
  'team_note',
] as const;
export type CaseEventKind = (typeof CASE_EVENT_KINDS)[number];

export interface CaseEventEntry {
  t: number;
  kind: CaseEventKind;
  note?: string;
}
