import type { StatsRow } from '@/lib/domain/statsRow';

export const RULES = ['apnea', 'prolonged_apnea', 'hypoxemia'] as const;

type Summary = NonNullable<StatsRow['summary']>;

let seq = 0;

/**
 * A StatsRow with plausible defaults; `episodes` sets per-rule episode counts, `summary: null`
 * makes a case without a summary for the rule set.
 */
export function row(over: Partial<Omit<StatsRow, 'summary'>> & { summary?: Partial<Summary> | null; episodes?: Partial<Record<(typeof RULES)[number] | string, number>> } = {}): StatsRow {
  seq++;
  const { summary, episodes, ...facts } = over;
  const rules: Summary['rules'] = {};
  for (const id of RULES) rules[id] = { episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null };
  for (const [id, n] of Object.entries(episodes ?? {})) rules[id] = { episodes: n ?? 0, totalDurationS: (n ?? 0) * 30, maxDurationS: n ? 30 : 0, firstResponseS: null };
  const count = Object.values(rules).reduce((a, r) => a + r.episodes, 0);
  const date = facts.date ?? '2026-11-10';
  return {
    caseId: `case-${seq}`,
    key: `k-${seq}`,
    unitId: 'unit-1',
    date,
    month: date.slice(0, 7),
    status: 'signed',
    roomId: 'room-1',
    room: 'Room 1',
    procedureType: 'colonoscopy',
    plannedDepth: 'moderate',
    asaClass: 'II',
    asaEmergency: false,
    ageYears: 55,
    sex: 'female',
    bmi: 24,
    stopBangScore: 2,
    stopBangBand: 'low',
    regimen: 'propofol',
    proceduralistId: 'dr-a',
    proceduralist: 'Dr A',
    nurseId: 'nurse-a',
    nurse: 'Nurse A',
    interventions: [],
    documentation: { asaClass: true, weight: true, stopBang: true, longestVitalsGapS: 120 },
    ...facts,
    summary:
      summary === null
        ? null
        : {
            ruleSetId: 'plateau-default',
            ruleSetVersion: 1,
            caseLevel: count > 0 ? 'observed' : 'none',
            majorPhysiology: false,
            episodeCount: count,
            lowestSpo2: 95,
            capnoCoveragePct: 100,
            sedationS: 900,
            firstApneaResponseS: null,
            rules,
            ...summary,
          },
  };
}
