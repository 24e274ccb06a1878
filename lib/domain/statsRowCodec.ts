import type { CaseLevel } from './intervention';
import type { Regimen } from './regimen';
import type { StatsRow } from './statsRow';

/**
 * A compact, positional form of a StatsRow for the statistics rollup (one JSON array per case,
 * about a third the size of the object): what varies per case only. What a whole rollup shares
 * — the unit, the rule set, the status — and what may change after packing — the names of
 * rooms, proceduralists and nurses — are given back when unpacking. Rules without an episode
 * are left out and come back as the shared zero entry. Bump STATS_ROW_FORMAT whenever the
 * layout or anything computed into it changes: stored rows of another format are rebuilt.
 */
export const STATS_ROW_FORMAT = 1;

type RuleTuple = [ruleId: string, episodes: number, totalDurationS: number, maxDurationS: number, firstResponseS: number | null];
type SummaryTuple = [caseLevel: string, majorPhysiology: 0 | 1, episodeCount: number, lowestSpo2: number | null, capnoCoveragePct: number | null, sedationS: number | null, firstApneaResponseS: number | null, rules: RuleTuple[]];
export type PackedStatsRow = [
  caseId: string,
  key: string | null,
  date: string,
  /** The case start (epoch ms): orders cases within a day. */
  startMs: number,
  roomId: string | null,
  procedureType: string,
  plannedDepth: string,
  asaClass: string | null,
  asaEmergency: 0 | 1,
  ageYears: number | null,
  sex: string,
  bmi: number | null,
  stopBangScore: number | null,
  stopBangBand: StatsRow['stopBangBand'],
  regimen: string,
  proceduralistId: string | null,
  nurseId: string | null,
  interventions: string[],
  documentation: [asaClass: 0 | 1, weight: 0 | 1, stopBang: 0 | 1, longestVitalsGapS: number | null],
  summary: SummaryTuple | null,
];

const bit = (b: boolean): 0 | 1 => (b ? 1 : 0);

/**
 * Packs a row; `startMs` is the case start, which StatsRow does not carry.
 *
 * @example
 * packStatsRow(row, Date.parse('2026-03-02T09:00:00Z'))[0] //=> row.caseId
 */
export function packStatsRow(r: StatsRow, startMs: number): PackedStatsRow {
  const s = r.summary;
  return [
    r.caseId,
    r.key,
    r.date,
    startMs,
    r.roomId,
    r.procedureType,
    r.plannedDepth,
    r.asaClass,
    bit(r.asaEmergency),
    r.ageYears,
    r.sex,
    r.bmi,
    r.stopBangScore,
    r.stopBangBand,
    r.regimen,
    r.proceduralistId,
    r.nurseId,
    r.interventions,
    [bit(r.documentation.asaClass), bit(r.documentation.weight), bit(r.documentation.stopBang), r.documentation.longestVitalsGapS],
    s
      ? [
          s.caseLevel,
          bit(s.majorPhysiology),
          s.episodeCount,
          s.lowestSpo2,
          s.capnoCoveragePct,
          s.sedationS,
          s.firstApneaResponseS,
          Object.entries(s.rules)
            .filter(([, x]) => x.episodes !== 0 || x.totalDurationS !== 0 || x.maxDurationS !== 0 || x.firstResponseS !== null)
            .map(([id, x]) => [id, x.episodes, x.totalDurationS, x.maxDurationS, x.firstResponseS]),
        ]
      : null,
  ];
}

export interface UnpackContext {
  unitId: string;
  status: string;
  ruleSetId: string;
  ruleSetVersion: number;
  /** Every rule id the rule-set version's summaries list (those not packed had no episode). */
  ruleIds: readonly string[];
  names: { room: ReadonlyMap<string, string>; proceduralist: ReadonlyMap<string, string>; user: ReadonlyMap<string, string> };
}

type RuleFacts = StatsRow extends { summary: infer S } ? (S extends { rules: Record<string, infer R> } ? R : never) : never;
/** The entry of a rule without episodes, shared (frozen) by every row: most rules of most cases have none. */
const NO_EPISODES: RuleFacts = Object.freeze({ episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null });

/** Unpacks a row packed by packStatsRow, with the names and shared facts of `ctx`. */
export function unpackStatsRow(p: PackedStatsRow, ctx: UnpackContext): StatsRow {
  const [caseId, key, date, , roomId, procedureType, plannedDepth, asaClass, asaEmergency, ageYears, sex, bmi, stopBangScore, stopBangBand, regimen, proceduralistId, nurseId, interventions, doc, s] = p;
  let summary: StatsRow['summary'] = null;
  if (s) {
    const rules: Record<string, RuleFacts> = {};
    for (const id of ctx.ruleIds) rules[id] = NO_EPISODES;
    for (const [id, episodes, totalDurationS, maxDurationS, firstResponseS] of s[7]) rules[id] = { episodes, totalDurationS, maxDurationS, firstResponseS };
    summary = {
      ruleSetId: ctx.ruleSetId,
      ruleSetVersion: ctx.ruleSetVersion,
      caseLevel: s[0] as CaseLevel,
      majorPhysiology: s[1] === 1,
      episodeCount: s[2],
      lowestSpo2: s[3],
      capnoCoveragePct: s[4],
      sedationS: s[5],
      firstApneaResponseS: s[6],
      rules,
    };
  }
  return {
    caseId,
    key,
    unitId: ctx.unitId,
    date,
    month: date.slice(0, 7),
    status: ctx.status,
    roomId,
    room: roomId === null ? null : (ctx.names.room.get(roomId) ?? null),
    procedureType,
    plannedDepth,
    asaClass,
    asaEmergency: asaEmergency === 1,
    ageYears,
    sex,
    bmi,
    stopBangScore,
    stopBangBand,
    regimen: regimen as Regimen,
    proceduralistId,
    proceduralist: proceduralistId === null ? null : (ctx.names.proceduralist.get(proceduralistId) ?? null),
    nurseId,
    nurse: nurseId === null ? null : (ctx.names.user.get(nurseId) ?? null),
    interventions,
    summary,
    documentation: { asaClass: doc[0] === 1, weight: doc[1] === 1, stopBang: doc[2] === 1, longestVitalsGapS: doc[3] },
  };
}
