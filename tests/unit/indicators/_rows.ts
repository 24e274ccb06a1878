/** Constructed StatsRows for the indicator tests: one signed moderate-sedation case, fully documented, no events. */
import type { StatsRow } from '@/lib/domain/statsRow';

let seq = 0;

export interface RowOptions {
  date?: string;
  unitId?: string;
  depth?: string;
  interventions?: string[];
  /** Episode counts per rule. */
  episodes?: Record<string, number>;
  caseLevel?: NonNullable<StatsRow['summary']>['caseLevel'];
  capno?: number | null;
  lowestSpo2?: number | null;
  firstApneaResponseS?: number | null;
  noSummary?: boolean;
  documentation?: Partial<StatsRow['documentation']>;
}

export function row(o: RowOptions = {}): StatsRow {
  seq++;
  const date = o.date ?? '2026-09-15';
  const rules: NonNullable<StatsRow['summary']>['rules'] = {};
  for (const id of ['apnea', 'prolonged_apnea', 'hypoventilation', 'low_etco2', 'bradypnea', 'hypoxemia', 'severe_hypoxemia', 'prolonged_hypoxemia', 'critical_hypoxemia']) {
    const n = o.episodes?.[id] ?? 0;
    rules[id] = { episodes: n, totalDurationS: n * 30, maxDurationS: n ? 30 : 0, firstResponseS: null };
  }
  return {
    caseId: `case-secret-${seq}`,
    key: `KEY-SECRET-${seq}`,
    unitId: o.unitId ?? 'unit-a',
    date,
    month: date.slice(0, 7),
    status: 'signed',
    roomId: 'room-1',
    room: 'Room Secretroom',
    procedureType: 'colonoscopy',
    plannedDepth: o.depth ?? 'moderate',
    asaClass: 'II',
    asaEmergency: false,
    ageYears: 61,
    sex: 'female',
    bmi: 27.1,
    stopBangScore: 2,
    stopBangBand: 'low',
    regimen: 'propofol',
    proceduralistId: 'p-1',
    proceduralist: 'Dr Proceduralist Secretname',
    nurseId: 'n-1',
    nurse: 'Nurse Secretname',
    interventions: o.interventions ?? [],
    summary: o.noSummary
      ? null
      : {
          ruleSetId: 'plateau-default',
          ruleSetVersion: 1,
          caseLevel: o.caseLevel ?? 'none',
          majorPhysiology: false,
          episodeCount: Object.values(o.episodes ?? {}).reduce((a, b) => a + b, 0),
          lowestSpo2: o.lowestSpo2 === undefined ? 95 : o.lowestSpo2,
          capnoCoveragePct: o.capno === undefined ? 100 : o.capno,
          sedationS: 1800,
          firstApneaResponseS: o.firstApneaResponseS ?? null,
          rules,
        },
    documentation: { asaClass: true, weight: true, stopBang: true, longestVitalsGapS: 300, ...o.documentation },
  };
}

/** `n` rows, the first `x` of them with `event` applied. */
export function rows(n: number, x: number, base: RowOptions, event: RowOptions): StatsRow[] {
  return Array.from({ length: n }, (_, i) => row(i < x ? { ...base, ...event } : base));
}

export const SCOPE = { unitIds: ['unit-a'], units: [{ id: 'unit-a', name: 'Unit A' }], label: 'Unit A' };
