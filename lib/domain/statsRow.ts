import type { CaseLevel } from './intervention';
import type { Regimen } from './regimen';

/**
 * One case as the review and the indicators count it: the facts to break down by, and the
 * stored per-case summary of one rule-set version. Built from CaseSummary rows, never from
 * raw samples, so statistics do not grow with sample volume.
 */
export interface StatsRow {
  caseId: string;
  key: string | null;
  unitId: string;
  /** YYYY-MM-DD in the unit's zone. */
  date: string;
  month: string;
  status: string;
  roomId: string | null;
  room: string | null;
  procedureType: string;
  plannedDepth: string;
  asaClass: string | null;
  asaEmergency: boolean;
  ageYears: number | null;
  sex: string;
  bmi: number | null;
  stopBangScore: number | null;
  stopBangBand: 'low' | 'intermediate' | 'high' | null;
  regimen: Regimen;
  proceduralistId: string | null;
  proceduralist: string | null;
  nurseId: string | null;
  nurse: string | null;
  /** Interventions recorded (not voided), by kind. */
  interventions: string[];
  /** Null when the case has no summary for the rule set. */
  summary: {
    ruleSetId: string;
    ruleSetVersion: number;
    caseLevel: CaseLevel;
    majorPhysiology: boolean;
    episodeCount: number;
    lowestSpo2: number | null;
    capnoCoveragePct: number | null;
    sedationS: number | null;
    firstApneaResponseS: number | null;
    rules: Record<string, { episodes: number; totalDurationS: number; maxDurationS: number; firstResponseS: number | null }>;
  } | null;
  documentation: {
    asaClass: boolean;
    weight: boolean;
    stopBang: boolean;
    /** Longest gap (s) between manual BP/HR readings during sedation; null without a sedation time. */
    longestVitalsGapS: number | null;
  };
}
