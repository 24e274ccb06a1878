import { createHash } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { loadCaseRecord } from './caseRecord';
import { analyzeCase, getBuiltInRuleSet } from '@/lib/rules';
import { appendAudit } from './audit';
import type { RuleSet } from '@/lib/domain/ruleSet';
import type { Analysis } from '@/lib/domain/episode';
import type { CaseRecord } from '@/lib/domain/caseRecord';

/** The rule set a unit's screens use (built-in, or a saved version in RuleSetVersion). */
export async function activeRuleSet(client: PrismaClient, unitId: string): Promise<RuleSet> {
  const unit = await client.unit.findUnique({ where: { id: unitId }, select: { activeRuleSetId: true, activeRuleSetVersion: true } });
  return resolveRuleSet(client, unit?.activeRuleSetId ?? 'plateau-default', unit?.activeRuleSetVersion ?? 1);
}

export async function resolveRuleSet(client: PrismaClient, id: string, version: number): Promise<RuleSet> {
  const built = getBuiltInRuleSet(id, version);
  if (built) return built;
  const saved = await client.ruleSetVersion.findUnique({ where: { ruleSetId_version: { ruleSetId: id, version } } });
  if (!saved) throw new Error(`rule set ${id} v${version} not found`);
  return JSON.parse(saved.definition) as RuleSet;
}

/** Hash of what a summary depends on: the record and the rule set's id and version. */
export function inputHash(record: CaseRecord, ruleSet: RuleSet): string {
  return createHash('sha256').update(JSON.stringify([ruleSet.id, ruleSet.version, record])).digest('hex');
}

/**
 * Recomputes a case's stored summary for a rule set when its inputs changed (derived data:
 * never edited by hand). Returns the analysis.
 */
export async function refreshSummary(client: PrismaClient, caseId: string, now: Date, ruleSet?: RuleSet): Promise<Analysis | null> {
  const record = await loadCaseRecord(client, caseId);
  if (!record) return null;
  const c = await client.case.findUnique({ where: { id: caseId }, select: { unitId: true } });
  const rs = ruleSet ?? (await activeRuleSet(client, c!.unitId));
  const hash = inputHash(record, rs);
  const existing = await client.caseSummary.findUnique({ where: { caseId_ruleSetId_ruleSetVersion: { caseId, ruleSetId: rs.id, ruleSetVersion: rs.version } } });
  if (existing && existing.inputHash === hash) return JSON.parse(existing.analysisJson) as Analysis;
  const analysis = analyzeCase(record, rs);
  await storeSummary(client, caseId, rs, analysis, hash, now);
  return analysis;
}

async function storeSummary(client: PrismaClient, caseId: string, rs: RuleSet, a: Analysis, hash: string, now: Date) {
  const s = a.summary;
  const id = `${caseId}:${rs.id}:${rs.version}`;
  const perRule = s.rules.map((r) => {
    const eps = a.episodes.filter((e) => e.rule === r.rule);
    const responses = eps.map((e) => e.responseS).filter((x): x is number => x !== null);
    return {
      caseId,
      ruleId: r.rule,
      episodes: r.episodeCount,
      totalDurationS: r.totalDurationS,
      maxDurationS: eps.reduce((m, e) => Math.max(m, e.durationS), 0),
      firstResponseS: eps.length && eps[0].responseS !== null ? eps[0].responseS : responses.length ? responses[0] : null,
    };
  });
  const firstApnea = a.episodes.find((e) => e.rule === 'apnea');
  const data = {
    caseId,
    ruleSetId: rs.id,
    ruleSetVersion: rs.version,
    inputHash: hash,
    computedAt: now,
    caseLevel: s.caseLevel,
    majorPhysiology: s.majorPhysiology,
    episodeCount: s.episodeCount,
    lowestSpo2: s.lowestSpo2?.value ?? null,
    highestEtco2: s.highestEtco2?.value ?? null,
    lowestEtco2: s.lowestEtco2?.value ?? null,
    lowestRr: s.lowestRr?.value ?? null,
    capnoCoveragePct: s.capnographyCoveragePct,
    sedationS: s.sedationTime ? s.sedationTime.end - s.sedationTime.start : null,
    firstApneaResponseS: firstApnea?.responseS ?? null,
    analysisJson: JSON.stringify(a),
  };
  await client.$transaction([
    client.caseSummary.deleteMany({ where: { id } }),
    client.caseSummary.create({ data: { id, ...data, rules: { create: perRule } } }),
  ]);
}

/** Recomputes every case's summary for its unit's active rule set; returns how many. */
export async function recomputeAllSummaries(client: PrismaClient, now: Date, onProgress?: (done: number, total: number) => void): Promise<number> {
  const cases = await client.case.findMany({ select: { id: true, unitId: true }, orderBy: { id: 'asc' } });
  const ruleSets = new Map<string, RuleSet>();
  let done = 0;
  for (const c of cases) {
    let rs = ruleSets.get(c.unitId);
    if (!rs) ruleSets.set(c.unitId, (rs = await activeRuleSet(client, c.unitId)));
    await refreshSummary(client, c.id, now, rs);
    done++;
    onProgress?.(done, cases.length);
  }
  return done;
}

/**
 * Makes a rule set the unit's active one and brings every case's stored summary up to date for
 * it (cases already computed for that version are skipped by their input hash).
 */
export async function setActiveRuleSet(client: PrismaClient, unitId: string, ref: { id: string; version: number }, actor: { id: string; role: string; origin: string | null }, now: Date, onProgress?: (done: number, total: number) => void): Promise<{ recomputed: number }> {
  const rs = await resolveRuleSet(client, ref.id, ref.version);
  await client.$transaction(async (tx) => {
    const before = await tx.unit.findUniqueOrThrow({ where: { id: unitId }, select: { activeRuleSetId: true, activeRuleSetVersion: true } });
    await tx.unit.update({ where: { id: unitId }, data: { activeRuleSetId: rs.id, activeRuleSetVersion: rs.version } });
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'update', entity: 'unit_rule_set', entityId: unitId, before, after: { activeRuleSetId: rs.id, activeRuleSetVersion: rs.version }, origin: actor.origin });
  });
  const cases = await client.case.findMany({ where: { unitId }, select: { id: true }, orderBy: { id: 'asc' } });
  let done = 0;
  for (const c of cases) {
    await refreshSummary(client, c.id, now, rs);
    done++;
    onProgress?.(done, cases.length);
  }
  return { recomputed: done };
}
