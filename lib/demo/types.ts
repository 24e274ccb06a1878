/**
 * Shapes of the generated demo data. A demo case is a CaseRecord (the engine's one case shape)
 * plus the facts the database keeps beside it: who, where, the pre-sedation assessment, manual
 * vitals, recovery scores, and what the generator injected (the ground truth, for tests).
 */
import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { ProcedureId } from './unit';

export const REGIMENS = ['propofol', 'propofol_fentanyl', 'midazolam_fentanyl', 'ketamine'] as const;
/** Sedation regimen: `ketamine` may be given with a little midazolam (± glycopyrrolate). */
export type Regimen = (typeof REGIMENS)[number];

export type PlannedDepth = 'minimal' | 'moderate' | 'deep';
export type Mallampati = 'I' | 'II' | 'III' | 'IV';
export type DemoCaseStatus = 'draft' | 'in_progress' | 'signed';

export interface StopBang {
  snoring: boolean;
  tiredness: boolean;
  observedApnea: boolean;
  highBloodPressure: boolean;
  bmiOver35: boolean;
  ageOver50: boolean;
  neckOver40: boolean;
  male: boolean;
  /** 0–8. */
  score: number;
  /** Chung et al. 2016: 0–2 low, 3–4 intermediate, 5–8 high; also high with ≥ 2 STOP items plus male, BMI > 35 or neck > 40. */
  risk: 'low' | 'intermediate' | 'high';
}

export interface DemoAssessment {
  ageYears: number;
  sex: 'female' | 'male';
  weightKg: number;
  heightCm: number;
  /** One decimal. */
  bmi: number;
  /** ASA physical status 'I'–'IV', with suffix 'E' for an emergency (e.g. 'IIIE'). */
  asaClass: string;
  plannedDepth: PlannedDepth;
  mallampati: Mallampati;
  stopBang: StopBang;
  /** Hours since the last solid food and the last clear fluid (half-hour steps). */
  fasting: { solidsH: number; clearFluidsH: number };
}

/** A manual (cuff) blood pressure with the heart rate noted beside it; t in seconds from case start. */
export interface ManualVital {
  t: number;
  sbp: number;
  dbp: number;
  hr: number;
}

/** Modified Aldrete score (five items 0–2); t in seconds from case start. */
export interface AldreteScore {
  t: number;
  activity: number;
  respiration: number;
  circulation: number;
  consciousness: number;
  spo2: number;
  /** 0–10; discharge criterion ≥ 9. */
  total: number;
}

export const INJECTED_KINDS = ['apnea', 'hypoventilation', 'bradypnea', 'desaturation', 'line_disconnection', 'probe_off'] as const;
export type InjectedKind = (typeof INJECTED_KINDS)[number];

/**
 * What the generator put into the signals, in seconds from case start (`end` exclusive):
 * apnea = EtCO2 < 5 and RR 0; hypoventilation = EtCO2 ≥ 50 (the plateau); bradypnea = RR 3–7;
 * desaturation = SpO2 < 90 (about; values are rounded); line_disconnection = EtCO2 0 from an
 * abrupt fall; probe_off = SpO2 0 with probeOff (mode 'zero') or no SpO2 samples (mode 'gap').
 */
export interface InjectedEvent {
  kind: InjectedKind;
  start: number;
  end: number;
  /** Nadir SpO2, peak EtCO2 or the RR level, by kind. */
  value?: number;
  mode?: 'zero' | 'gap';
  /** Apnea and line disconnection: EtCO2 fell from ≥ 25 to < 5 mmHg within 5 s (rules.md §5 `onsetAbrupt`). */
  onsetAbrupt?: boolean;
}

export interface DemoCase {
  /** Stable key, e.g. 'demo-0001'. */
  key: string;
  status: DemoCaseStatus;
  patientMrn: string;
  roomId: string;
  procedureId: ProcedureId;
  proceduralistId: string;
  /** Username of the nurse who charts the sedation. */
  nurseUsername: string;
  regimen: Regimen;
  assessment: DemoAssessment;
  /** `record.case.start` is the scheduled start (monitoring begins there). Draft: no data; in progress: data up to "now". */
  record: CaseRecord;
  manualVitals: ManualVital[];
  aldrete: AldreteScore[];
  injected: InjectedEvent[];
  /** Signed cases: who signed and when (ISO UTC); otherwise null. */
  signed: { by: string; at: string } | null;
}
