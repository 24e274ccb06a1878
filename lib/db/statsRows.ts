import { rawFor } from './rawReader';
import type { PrismaClient } from './generated/client';
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

/** Separates values inside one group_concat column (never part of a drug, kind or ISO time). */
const SEP = '\u001f';

interface CaseSqlRow {
  id: string;
  key: string | null;
  unitId: string;
  scheduledDate: string;
  status: string;
  startAt: string;
  roomId: string | null;
  procedureType: string;
  plannedDepth: string;
  asaClass: string | null;
  asaEmergency: number;
  weightKg: number | null;
  heightCm: number | null;
  neckCm: number | null;
  sbSnoring: number | null;
  sbTired: number | null;
  sbObserved: number | null;
  sbPressure: number | null;
  sbNeck: number | null;
  proceduralistId: string | null;
  nurseId: string | null;
  birthDate: string;
  sex: string;
  /** Drug names of the case's doses, SEP-separated. */
  drugs: string | null;
  /** Intervention kinds in time order, SEP-separated. */
  interventions: string | null;
  /** `kind=epochMs` of sedation_start / sedation_end / recovery_start events, SEP-separated. */
  events: string | null;
  /** Epoch ms of manual readings with a BP or HR, SEP-separated. */
  vitalsMs: string | null;
  summaryId: string | null;
  caseLevel: string | null;
  majorPhysiology: number | null;
  episodeCount: number | null;
  lowestSpo2: number | null;
  capnoCoveragePct: number | null;
  sedationS: number | null;
  firstApneaResponseS: number | null;
  /** `ruleId,episodes,totalDurationS,maxDurationS,firstResponseS` of the rules with episodes, SEP-separated. */
  rules: string | null;
}

type RuleFacts = { episodes: number; totalDurationS: number; maxDurationS: number; firstResponseS: number | null };

/** The entry of a rule without episodes, shared (frozen) by every row: most rules of most cases have none. */
const NO_EPISODES: RuleFacts = Object.freeze({ episodes: 0, totalDurationS: 0, maxDurationS: 0, firstResponseS: null });


function caseFilter(q: StatsQuery): { sql: string; args: unknown[] } {
  const statuses = q.statuses ?? ['signed'];
  const parts = ['c.scheduledDate >= ?', 'c.scheduledDate <= ?'];
  const args: unknown[] = [q.from, q.to];
  if (statuses.length === 0) parts.push('0');
  else {
    parts.push(`c.status IN (${statuses.map(() => '?').join(', ')})`);
    args.push(...statuses);
  }
  if (q.unitIds) {
    if (q.unitIds.length === 0) parts.push('0');
    else {
      parts.push(`c.unitId IN (${q.unitIds.map(() => '?').join(', ')})`);
      args.push(...q.unitIds);
    }
  }
  return { sql: parts.join(' AND '), args };
}

/** An ISO text DateTime column as exact epoch milliseconds, in SQL. */
const MS = (col: string) => `CAST(round(unixepoch(${col}, 'subsec') * 1000) AS INTEGER)`;
/** A REAL as text that parses back to the same double. */
const REAL = (col: string) => `printf('%.17g', ${col})`;

const CASES_SQL = (where: string) => `SELECT c.id, c.key, c.unitId, c.scheduledDate, c.status, c.startAt, c.roomId, c.procedureType, c.plannedDepth,
    c.asaClass, c.asaEmergency, c.weightKg, c.heightCm, c.neckCm, c.sbSnoring, c.sbTired, c.sbObserved, c.sbPressure, c.sbNeck,
    c.proceduralistId, c.nurseId, pt.birthDate, pt.sex,
    (SELECT group_concat(d.drug, char(31)) FROM Dose d WHERE d.caseId = c.id AND d.voidedAt IS NULL) AS drugs,
    (SELECT group_concat(kind, char(31)) FROM (SELECT i.kind FROM Intervention i WHERE i.caseId = c.id AND i.voidedAt IS NULL ORDER BY i.at)) AS interventions,
    (SELECT group_concat(e.kind || '=' || ${MS('e.at')}, char(31)) FROM CaseEvent e WHERE e.caseId = c.id AND e.voidedAt IS NULL AND e.kind IN ('sedation_start', 'sedation_end', 'recovery_start')) AS events,
    (SELECT group_concat(${MS('v.at')}, char(31)) FROM ManualVital v WHERE v.caseId = c.id AND v.voidedAt IS NULL AND (v.sbp IS NOT NULL OR v.hr IS NOT NULL)) AS vitalsMs,
    s.id AS summaryId, s.caseLevel, s.majorPhysiology, s.episodeCount, s.lowestSpo2, s.capnoCoveragePct, s.sedationS, s.firstApneaResponseS,
    (SELECT group_concat(sr.ruleId || ',' || sr.episodes || ',' || ${REAL('sr.totalDurationS')} || ',' || ${REAL('sr.maxDurationS')} || ',' || CASE WHEN sr.firstResponseS IS NULL THEN '' ELSE ${REAL('sr.firstResponseS')} END, char(31))
       FROM CaseSummaryRule sr WHERE sr.summaryId = s.id AND (sr.episodes <> 0 OR sr.totalDurationS <> 0 OR sr.maxDurationS <> 0 OR sr.firstResponseS IS NOT NULL)) AS rules
  FROM "Case" c
    JOIN Patient pt ON pt.id = c.patientId
    LEFT JOIN CaseSummary s ON s.caseId = c.id AND s.ruleSetId = ? AND s.ruleSetVersion = ?
  WHERE ${where}
  ORDER BY c.scheduledDate, c.startAt, c.id`;

/** The rule ids a rule-set version's summaries list (every summary lists every rule of its set, rules.md §7). */
const RULE_IDS_SQL = `SELECT sr.ruleId FROM CaseSummaryRule sr WHERE sr.summaryId = (SELECT s.id FROM CaseSummary s WHERE s.ruleSetId = ? AND s.ruleSetVersion = ? LIMIT 1) ORDER BY sr.id`;

/** Names of rooms, proceduralists and users: small tables, read whole instead of joined per case. */
const NAMES_SQL = `SELECT 'room' AS t, id, name FROM Room UNION ALL SELECT 'proceduralist', id, name FROM Proceduralist UNION ALL SELECT 'user', id, displayName FROM "User"`;

/** The regimen of a case depends only on its drug names: computed once per distinct list. */
const regimenMemo = new Map<string, StatsRow['regimen']>();
function regimenOfList(drugs: string | null): StatsRow['regimen'] {
  const key = drugs ?? '';
  let r = regimenMemo.get(key);
  if (r === undefined) {
    r = regimenOf(drugs ? drugs.split(SEP) : []);
    if (regimenMemo.size < 10_000) regimenMemo.set(key, r);
  }
  return r;
}

/** STOP-Bang score and band depend on a few yes/no facts only: computed once per combination. */
const stopBangMemo = new Map<string, { score: number; band: 'low' | 'intermediate' | 'high' }>();

function stopBangOf(c: CaseSqlRow, b: number | null, age: number | null): { score: number; band: 'low' | 'intermediate' | 'high' } {
  const neck = c.neckCm !== null ? (c.neckCm > 40 ? 'N' : 'n') : c.sbNeck === null ? '?' : c.sbNeck ? 'A' : 'a';
  const key = `${c.sbSnoring}${c.sbTired}${c.sbObserved}${c.sbPressure}|${b === null ? '?' : b > 35 ? 1 : 0}|${age === null ? '?' : age > 50 ? 1 : 0}|${neck}|${c.sex}`;
  let r = stopBangMemo.get(key);
  if (!r) {
    const sb = stopBangFromFacts({
      answers: { snoring: !!c.sbSnoring, tired: !!c.sbTired, observedApnea: !!c.sbObserved, pressure: !!c.sbPressure, neckOver40: c.sbNeck === null ? null : !!c.sbNeck },
      bmi: b,
      age,
      sex: c.sex as 'female' | 'male',
      neckCm: c.neckCm,
    });
    r = { score: sb.score, band: sb.band };
    stopBangMemo.set(key, r);
  }
  return r;
}

/**
 * Loads the statistics rows of a period: case facts plus the summary of one rule-set version.
 * One raw SQL statement over the indexed tables (the per-case lists come back as group_concat
 * strings, the summary's per-rule rows only where the rule had episodes); about 30 ms per
 * 1,000 cases once warm on the development machine (docs/review.md). Voided doses, interventions, events and
 * vitals are left out. Sedation runs from the earliest `sedation_start` to the earliest
 * `sedation_end` (else `recovery_start`).
 */
export async function loadStatsRows(client: PrismaClient, q: StatsQuery): Promise<StatsRow[]> {
  const raw = await rawFor(client);
  const f = caseFilter(q);
  const cases = raw.prepare(CASES_SQL(f.sql)).all(q.ruleSetId, q.ruleSetVersion, ...f.args) as CaseSqlRow[];
  const ruleIds = cases.some((c) => c.summaryId !== null) ? (raw.prepare(RULE_IDS_SQL).pluck().all(q.ruleSetId, q.ruleSetVersion) as string[]) : [];
  const names = { room: new Map<string, string>(), proceduralist: new Map<string, string>(), user: new Map<string, string>() };
  if (cases.length) for (const n of raw.prepare(NAMES_SQL).all() as { t: keyof typeof names; id: string; name: string }[]) names[n.t].set(n.id, n.name);

  return cases.map((c) => {
    const startAt = new Date(c.startAt);
    const b = bmi(c.weightKg, c.heightCm);
    const age = ageInYears(c.birthDate, startAt);
    const answered = c.sbSnoring !== null && c.sbTired !== null && c.sbObserved !== null && c.sbPressure !== null;
    const sb = answered ? stopBangOf(c, b, age) : null;
    let sedStart: number | null = null;
    let sedEnd: number | null = null;
    let recStart: number | null = null;
    if (c.events) {
      for (const e of c.events.split(SEP)) {
        const eq = e.indexOf('=');
        const kind = e.slice(0, eq);
        const ms = Number(e.slice(eq + 1));
        if (kind === 'sedation_start') sedStart = sedStart === null ? ms : Math.min(sedStart, ms);
        else if (kind === 'sedation_end') sedEnd = sedEnd === null ? ms : Math.min(sedEnd, ms);
        else if (kind === 'recovery_start') recStart = recStart === null ? ms : Math.min(recStart, ms);
      }
    }
    sedEnd ??= recStart;
    let summary: StatsRow['summary'] = null;
    if (c.summaryId !== null) {
      const rules: Record<string, RuleFacts> = {};
      for (const id of ruleIds) rules[id] = NO_EPISODES;
      if (c.rules) {
        for (const part of c.rules.split(SEP)) {
          const [id, e, t, m, fr] = part.split(',');
          rules[id] = { episodes: Number(e), totalDurationS: Number(t), maxDurationS: Number(m), firstResponseS: fr === '' ? null : Number(fr) };
        }
      }
      summary = {
        ruleSetId: q.ruleSetId,
        ruleSetVersion: q.ruleSetVersion,
        caseLevel: c.caseLevel as CaseLevel,
        majorPhysiology: !!c.majorPhysiology,
        episodeCount: c.episodeCount ?? 0,
        lowestSpo2: c.lowestSpo2,
        capnoCoveragePct: c.capnoCoveragePct,
        sedationS: c.sedationS,
        firstApneaResponseS: c.firstApneaResponseS,
        rules,
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
      asaEmergency: !!c.asaEmergency,
      ageYears: age,
      sex: c.sex,
      bmi: b,
      stopBangScore: sb?.score ?? null,
      stopBangBand: sb?.band ?? null,
      regimen: regimenOfList(c.drugs),
      proceduralistId: c.proceduralistId,
      proceduralist: c.proceduralistId === null ? null : (names.proceduralist.get(c.proceduralistId) ?? null),
      nurseId: c.nurseId,
      nurse: c.nurseId === null ? null : (names.user.get(c.nurseId) ?? null),
      interventions: c.interventions ? c.interventions.split(SEP) : [],
      summary,
      documentation: {
        asaClass: c.asaClass !== null,
        weight: c.weightKg !== null,
        stopBang: answered,
        longestVitalsGapS: sedStart !== null && sedEnd !== null ? longestGap(sedStart, sedEnd, c.vitalsMs ? c.vitalsMs.split(SEP).map(Number) : []) : null,
      },
    };
    return row;
  });
}

/** Longest stretch of [start, end] (epoch ms) without a reading, in seconds. */
function longestGap(start: number, end: number, readings: number[]): number {
  const times = readings.filter((t) => t >= start && t <= end).sort((a, b) => a - b);
  let prev = start;
  let worst = 0;
  for (const t of times) {
    worst = Math.max(worst, t - prev);
    prev = t;
  }
  worst = Math.max(worst, end - prev);
  return worst / 1000;
}
