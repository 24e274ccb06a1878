/**
 * The statistics rows of a period (lib/domain/statsRow): case facts plus the stored summary of
 * one rule-set version. Two ways to the same rows:
 * - signed cases (what the review and the indicators count) come from the monthly rollups
 *   (lib/db/statsMonths.ts): a few hundred packed rows instead of a row per case;
 * - any other selection, and the rebuilding of a rollup, go through `joinedStatsRows`: one SQL
 *   statement over the case, its patient and its summary, plus set-based reads of the entries.
 * Statistics never read samples.
 */
import type { PrismaClient } from './generated/client';
import { sqlOf } from './client';
import { asBool, asBoolOrNull, asDate, chunkRows, placeholders, type Sql, type SqlValue } from './sql';
import { SEP, computeRollups } from './caseRollup';
import { loadFromMonths } from './statsMonths';
import type { StatsRow } from '@/lib/domain/statsRow';
import { regimenOf } from '@/lib/domain/regimen';
import { stopBangFromFacts } from '@/lib/domain/stopBang';
import { bmi } from '@/lib/domain/caseFacts';
import { ageInYears } from '@/lib/_shared/time';
import type { CaseLevel } from '@/lib/domain/intervention';

export interface StatsQuery {
  unitIds?: string[];
  /** Inclusive YYYY-MM-DD bounds on the scheduled date. */
  from: string;
  to: string;
  ruleSetId: string;
  ruleSetVersion: number;
  /** Only completed (signed) cases count by default. */
  statuses?: string[];
}

interface CaseSqlRow {
  id: string;
  key: string | null;
  unitId: string;
  scheduledDate: string;
  status: string;
  startAt: unknown;
  roomId: string | null;
  procedureType: string;
  plannedDepth: string;
  asaClass: string | null;
  asaEmergency: unknown;
  weightKg: number | null;
  heightCm: number | null;
  neckCm: number | null;
  sbSnoring: unknown;
  sbTired: unknown;
  sbObserved: unknown;
  sbPressure: unknown;
  sbNeck: unknown;
  proceduralistId: string | null;
  nurseId: string | null;
  birthDate: string;
  sex: string;
  summaryId: string | null;
  caseLevel: string | null;
  majorPhysiology: unknown;
  episodeCount: number | null;
  lowestSpo2: number | null;
  capnoCoveragePct: number | null;
  sedationS: number | null;
  firstApneaResponseS: number | null;
}

type RuleFacts = { episodes: number; totalDurationS: number; maxDurationS: number; firstResponseS: number | null };

/** The entry of a rule without episodes, shared (frozen) by every row: most rules of most cases have none. */
const NO_EPISODES: RuleFacts = Object.freeze({ episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null });

/** ` AND <column> IN (…)` for a unit filter: nothing without one, no rows for an empty one. */
export function unitFilter(unitIds: readonly string[] | undefined, column: string): { sql: string; args: SqlValue[] } {
  if (!unitIds) return { sql: '', args: [] };
  if (unitIds.length === 0) return { sql: ' AND 1 = 0', args: [] };
  return { sql: ` AND ${column} IN (${placeholders(unitIds.length)})`, args: [...unitIds] };
}

function caseFilter(q: StatsQuery): { sql: string; args: SqlValue[] } {
  const statuses = q.statuses ?? ['signed'];
  const status = statuses.length === 0 ? ' AND 1 = 0' : ` AND c."status" IN (${placeholders(statuses.length)})`;
  const units = unitFilter(q.unitIds, 'c."unitId"');
  return { sql: `c."scheduledDate" >= ? AND c."scheduledDate" <= ?${status}${units.sql}`, args: [q.from, q.to, ...statuses, ...units.args] };
}

const CASES_SQL = (where: string) => `SELECT c."id", c."key", c."unitId", c."scheduledDate", c."status", c."startAt", c."roomId", c."procedureType", c."plannedDepth",
    c."asaClass", c."asaEmergency", c."weightKg", c."heightCm", c."neckCm", c."sbSnoring", c."sbTired", c."sbObserved", c."sbPressure", c."sbNeck",
    c."proceduralistId", c."nurseId", pt."birthDate", pt."sex",
    s."id" AS "summaryId", s."caseLevel", s."majorPhysiology", s."episodeCount", s."lowestSpo2", s."capnoCoveragePct", s."sedationS", s."firstApneaResponseS"
  FROM "Case" c
    JOIN "Patient" pt ON pt."id" = c."patientId"
    LEFT JOIN "CaseSummary" s ON s."caseId" = c."id" AND s."ruleSetId" = ? AND s."ruleSetVersion" = ?
  WHERE ${where}
  ORDER BY c."scheduledDate", c."startAt", c."id"`;

/** The rule ids a rule-set version's summaries list (every summary lists every rule of its set, rules.md §7). */
export async function summaryRuleIds(q: Sql, ruleSetId: string, ruleSetVersion: number): Promise<string[]> {
  const rows = await q.all<{ ruleId: string }>(
    `SELECT sr."ruleId" FROM "CaseSummaryRule" sr WHERE sr."summaryId" = (SELECT s."id" FROM "CaseSummary" s WHERE s."ruleSetId" = ? AND s."ruleSetVersion" = ? LIMIT 1) ORDER BY sr."id"`,
    [ruleSetId, ruleSetVersion],
  );
  return rows.map((r) => r.ruleId);
}

/** Names of rooms, proceduralists and users: small tables, read whole instead of joined per case. */
export async function statsNames(q: Sql): Promise<{ room: Map<string, string>; proceduralist: Map<string, string>; user: Map<string, string> }> {
  const names = { room: new Map<string, string>(), proceduralist: new Map<string, string>(), user: new Map<string, string>() };
  const rows = await q.all<{ t: keyof typeof names; id: string; name: string }>(
    `SELECT 'room' AS "t", "id", "name" FROM "Room" UNION ALL SELECT 'proceduralist', "id", "name" FROM "Proceduralist" UNION ALL SELECT 'user', "id", "displayName" FROM "User"`,
  );
  for (const n of rows) names[n.t].set(n.id, n.name);
  return names;
}

/** The rules with episodes of each summary, from its CaseSummaryRule rows. */
async function rulesWithEpisodes(q: Sql, summaryIds: string[]): Promise<Map<string, [string, RuleFacts][]>> {
  const out = new Map<string, [string, RuleFacts][]>();
  for (const ids of chunkRows(summaryIds, 1, 500)) {
    const rows = await q.all<{ summaryId: string; ruleId: string; episodes: number; totalDurationS: number; maxDurationS: number; firstResponseS: number | null }>(
      `SELECT "summaryId", "ruleId", "episodes", "totalDurationS", "maxDurationS", "firstResponseS" FROM "CaseSummaryRule"
       WHERE "summaryId" IN (${placeholders(ids.length)}) AND ("episodes" <> 0 OR "totalDurationS" <> 0 OR "maxDurationS" <> 0 OR "firstResponseS" IS NOT NULL)
       ORDER BY "summaryId", "id"`,
      ids,
    );
    for (const r of rows) {
      const l = out.get(r.summaryId) ?? [];
      l.push([r.ruleId, { episodes: r.episodes, totalDurationS: r.totalDurationS, maxDurationS: r.maxDurationS, firstResponseS: r.firstResponseS }]);
      out.set(r.summaryId, l);
    }
  }
  return out;
}

/** The regimen of a case depends only on its drug names: computed once per distinct list. */
const regimenMemo = new Map<string, StatsRow['regimen']>();
function regimenOfList(drugs: readonly string[]): StatsRow['regimen'] {
  const key = drugs.join(SEP);
  let r = regimenMemo.get(key);
  if (r === undefined) {
    r = regimenOf(drugs);
    if (regimenMemo.size < 10_000) regimenMemo.set(key, r);
  }
  return r;
}

/**
 * Statistics rows straight from the case tables, with each row's case start (epoch ms):
 * one statement for the cases, their patients and summaries, then set-based reads of the
 * entries (lib/db/caseRollup) and of the rules with episodes. Voided entries are left out.
 */
export async function joinedStatsRows(q: Sql, query: StatsQuery): Promise<{ row: StatsRow; startMs: number }[]> {
  const f = caseFilter(query);
  const cases = await q.all<CaseSqlRow>(CASES_SQL(f.sql), [query.ruleSetId, query.ruleSetVersion, ...f.args]);
  if (cases.length === 0) return [];
  const withSummary = cases.filter((c) => c.summaryId !== null).map((c) => c.summaryId!);
  const [ruleIds, names, entries, rules] = await Promise.all([
    withSummary.length ? summaryRuleIds(q, query.ruleSetId, query.ruleSetVersion) : Promise.resolve([] as string[]),
    statsNames(q),
    computeRollups(
      q,
      cases.map((c) => c.id),
    ),
    rulesWithEpisodes(q, withSummary),
  ]);
  return cases.map((c) => {
    const startAt = asDate(c.startAt);
    const b = bmi(c.weightKg, c.heightCm);
    const age = ageInYears(c.birthDate, startAt);
    const answered = c.sbSnoring !== null && c.sbTired !== null && c.sbObserved !== null && c.sbPressure !== null;
    const sb = answered
      ? stopBangFromFacts({
          answers: { snoring: asBool(c.sbSnoring), tired: asBool(c.sbTired), observedApnea: asBool(c.sbObserved), pressure: asBool(c.sbPressure), neckOver40: asBoolOrNull(c.sbNeck) },
          bmi: b,
          age,
          sex: c.sex as 'female' | 'male',
          neckCm: c.neckCm,
        })
      : null;
    const e = entries.get(c.id)!;
    let summary: StatsRow['summary'] = null;
    if (c.summaryId !== null) {
      const byRule: Record<string, RuleFacts> = {};
      for (const id of ruleIds) byRule[id] = NO_EPISODES;
      for (const [id, facts] of rules.get(c.summaryId) ?? []) byRule[id] = facts;
      summary = {
        ruleSetId: query.ruleSetId,
        ruleSetVersion: query.ruleSetVersion,
        caseLevel: c.caseLevel as CaseLevel,
        majorPhysiology: asBool(c.majorPhysiology),
        episodeCount: c.episodeCount ?? 0,
        lowestSpo2: c.lowestSpo2,
        capnoCoveragePct: c.capnoCoveragePct,
        sedationS: c.sedationS,
        firstApneaResponseS: c.firstApneaResponseS,
        rules: byRule,
      };
    }
    const row: StatsRow = {
      caseId: c.id,
      key: c.key,
      unitId: c.unitId,
      date: c.scheduledDate,
      month: c.scheduledDate.slice(0, 7),
      status: c.status,
      roomId: c.roomId,
      room: c.roomId === null ? null : (names.room.get(c.roomId) ?? null),
      procedureType: c.procedureType,
      plannedDepth: c.plannedDepth,
      asaClass: c.asaClass,
      asaEmergency: asBool(c.asaEmergency),
      ageYears: age,
      sex: c.sex,
      bmi: b,
      stopBangScore: sb?.score ?? null,
      stopBangBand: sb?.band ?? null,
      regimen: regimenOfList(e.drugs),
      proceduralistId: c.proceduralistId,
      proceduralist: c.proceduralistId === null ? null : (names.proceduralist.get(c.proceduralistId) ?? null),
      nurseId: c.nurseId,
      nurse: c.nurseId === null ? null : (names.user.get(c.nurseId) ?? null),
      interventions: e.interventions,
      summary,
      documentation: { asaClass: c.asaClass !== null, weight: c.weightKg !== null, stopBang: answered, longestVitalsGapS: e.longestVitalsGapS },
    };
    return { row, startMs: startAt.getTime() };
  });
}

/**
 * Loads the statistics rows of a period: case facts plus the summary of one rule-set version,
 * ordered by scheduled date, case start and id. Signed cases only by default, read from the
 * monthly rollups; other statuses from the case tables. Voided entries are left out.
 */
export async function loadStatsRows(client: PrismaClient, query: StatsQuery): Promise<StatsRow[]> {
  const q = sqlOf(client);
  const statuses = query.statuses ?? ['signed'];
  if (statuses.length === 1 && statuses[0] === 'signed') return loadFromMonths(q, query);
  return (await joinedStatsRows(q, query)).map((x) => x.row);
}
