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

/** Loads the statistics rows of a period: case facts plus the summary of one rule-set version. */
export async function loadStatsRows(client: PrismaClient, q: StatsQuery): Promise<StatsRow[]> {
  const cases = await client.case.findMany({
    where: {
      scheduledDate: { gte: q.from, lte: q.to },
      ...(q.unitIds ? { unitId: { in: q.unitIds } } : {}),
      status: { in: q.statuses ?? ['signed'] },
    },
    orderBy: [{ scheduledDate: 'asc' }, { startAt: 'asc' }],
    select: {
      id: true,
      key: true,
      unitId: true,
      scheduledDate: true,
      status: true,
      startAt: true,
      roomId: true,
      room: { select: { name: true } },
      procedureType: true,
      plannedDepth: true,
      asaClass: true,
      asaEmergency: true,
      weightKg: true,
      heightCm: true,
      neckCm: true,
      sbSnoring: true,
      sbTired: true,
      sbObserved: true,
      sbPressure: true,
      sbNeck: true,
      proceduralistId: true,
      proceduralist: { select: { name: true } },
      nurseId: true,
      nurse: { select: { displayName: true } },
      patient: { select: { birthDate: true, sex: true } },
      doses: { where: { voidedAt: null }, select: { drug: true } },
      interventions: { where: { voidedAt: null }, select: { kind: true } },
      events: { where: { voidedAt: null }, select: { kind: true, at: true } },
      vitals: { where: { voidedAt: null }, select: { at: true, sbp: true, hr: true } },
      summaries: {
        where: { ruleSetId: q.ruleSetId, ruleSetVersion: q.ruleSetVersion },
        select: { caseLevel: true, majorPhysiology: true, episodeCount: true, lowestSpo2: true, capnoCoveragePct: true, sedationS: true, firstApneaResponseS: true, rules: { select: { ruleId: true, episodes: true, totalDurationS: true, maxDurationS: true, firstResponseS: true } } },
      },
    },
  });
  return cases.map((c) => {
    const b = bmi(c.weightKg, c.heightCm);
    const age = ageInYears(c.patient.birthDate, c.startAt);
    const answered = c.sbSnoring !== null && c.sbTired !== null && c.sbObserved !== null && c.sbPressure !== null;
    const sb = answered
      ? stopBangFromFacts({ answers: { snoring: !!c.sbSnoring, tired: !!c.sbTired, observedApnea: !!c.sbObserved, pressure: !!c.sbPressure, neckOver40: c.sbNeck }, bmi: b, age, sex: c.patient.sex as 'female' | 'male', neckCm: c.neckCm })
      : null;
    const s = c.summaries[0];
    const sedStart = c.events.find((e) => e.kind === 'sedation_start')?.at ?? null;
    const sedEnd = c.events.find((e) => e.kind === 'sedation_end')?.at ?? c.events.find((e) => e.kind === 'recovery_start')?.at ?? null;
    return {
      caseId: c.id,
      key: c.key,
      unitId: c.unitId,
      date: c.scheduledDate,
      month: c.scheduledDate.slice(0, 7),
      status: c.status,
      roomId: c.roomId,
      room: c.room?.name ?? null,
      procedureType: c.procedureType,
      plannedDepth: c.plannedDepth,
      asaClass: c.asaClass,
      asaEmergency: c.asaEmergency,
      ageYears: age,
      sex: c.patient.sex,
      bmi: b,
      stopBangScore: sb?.score ?? null,
      stopBangBand: sb?.band ?? null,
      regimen: regimenOf(c.doses.map((d) => d.drug)),
      proceduralistId: c.proceduralistId,
      proceduralist: c.proceduralist?.name ?? null,
      nurseId: c.nurseId,
      nurse: c.nurse?.displayName ?? null,
      interventions: c.interventions.map((i) => i.kind),
      summary: s
        ? {
            ruleSetId: q.ruleSetId,
            ruleSetVersion: q.ruleSetVersion,
            caseLevel: s.caseLevel as CaseLevel,
            majorPhysiology: s.majorPhysiology,
            episodeCount: s.episodeCount,
            lowestSpo2: s.lowestSpo2,
            capnoCoveragePct: s.capnoCoveragePct,
            sedationS: s.sedationS,
            firstApneaResponseS: s.firstApneaResponseS,
            rules: Object.fromEntries(s.rules.map((r) => [r.ruleId, { episodes: r.episodes, totalDurationS: r.totalDurationS, maxDurationS: r.maxDurationS, firstResponseS: r.firstResponseS }])),
          }
        : null,
      documentation: {
        asaClass: c.asaClass !== null,
        weight: c.weightKg !== null,
        stopBang: answered,
        longestVitalsGapS: sedStart && sedEnd ? longestGap(sedStart, sedEnd, c.vitals.filter((v) => v.sbp !== null || v.hr !== null).map((v) => v.at)) : null,
      },
    } satisfies StatsRow;
  });
}

/** Longest stretch of [start, end] without a reading (s). */
function longestGap(start: Date, end: Date, readings: Date[]): number {
  const times = readings.map((d) => d.getTime()).filter((t) => t >= start.getTime() && t <= end.getTime()).sort((a, b) => a - b);
  let prev = start.getTime();
  let worst = 0;
  for (const t of [...times, end.getTime()]) {
    worst = Math.max(worst, t - prev);
    prev = t;
  }
  return worst / 1000;
}
