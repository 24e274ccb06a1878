import { createHash } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { loadCaseRecord } from './caseRecord';
import { loadCaseRows, type CaseRows } from './caseRows';
import { sqlOf } from './client';
import type { Sql } from './sql';
import { analyzeCase, getBuiltInRuleSet } from '@/lib/rules';
import { appendAudit } from './audit';
import { writeTx } from './tx';
import { rebuildAllStatsMonths, summaryId, summaryLockKey } from './statsMonths';
import type { RuleSet } from '@/lib/domain/ruleSet';
import type { Analysis } from '@/lib/domain/episode';
import type { CaseRecord } from '@/lib/domain/caseRecord';

/** The rule set a unit's screens use (built-in, or a saved version in RuleSetVersion). */
export async function activeRuleSet(client: PrismaClient, unitId: string): Promise<RuleSet> {
  const unit = await sqlOf(client).get<{ activeRuleSetId: string; activeRuleSetVersion: number }>('SELECT "activeRuleSetId", "activeRuleSetVersion" FROM "Unit" WHERE "id" = ?', [unitId]);
  return resolveRuleSet(client, unit?.activeRuleSetId ?? 'plateau-default', Number(unit?.activeRuleSetVersion ?? 1));
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
 * never edited by hand). Returns the analysis. `rows`: the case's rows when the caller has just
 * read them (the case sheet), so they are not read twice.
 */
export async function refreshSummary(client: PrismaClient, caseId: string, now: Date, ruleSet?: RuleSet, rows?: CaseRows): Promise<Analysis | null> {
  const q = sqlOf(client);
  const all = rows ?? (await loadCaseRows(q, caseId));
  if (!all) return null;
  const record = await loadCaseRecord(client, caseId, all);
  if (!record) return null;
  const rs = ruleSet ?? (await activeRuleSet(client, all.case.unitId));
  const hash = inputHash(record, rs);
  const existing = await q.get<{ inputHash: string; analysisJson: string }>('SELECT "inputHash", "analysisJson" FROM "CaseSummary" WHERE "id" = ?', [summaryId(caseId, rs)]);
  if (existing && existing.inputHash === hash) return JSON.parse(existing.analysisJson) as Analysis;
  const analysis = analyzeCase(record, rs);
  await storeSummary(q, caseId, rs, analysis, hash, now);
  return analysis;
}


async function storeSummary(q: Sql, caseId: string, rs: RuleSet, a: Analysis, hash: string, now: Date) {
  const s = a.summary;
  const id = summaryId(caseId, rs);
  const perRule = s.rules.map((r) => {
    const eps = a.episodes.filter((e) => e.rule === r.rule);
    const responses = eps.map((e) => e.responseS).filter((x): x is number => x !== null);
    return [
      id,
      caseId,
      r.rule,
      r.episodeCount,
      r.totalDurationS,
      eps.reduce((m, e) => Math.max(m, e.durationS), 0),
      eps.length && eps[0].responseS !== null ? eps[0].responseS : responses.length ? responses[0] : null,
    ];
  });
  const firstApnea = a.episodes.find((e) => e.rule === 'apnea');
  // A summary is stored under its own lock, so only another store of the same summary waits (a
  // bedside sheet stores them often). When the case is signed, the summary also feeds the
  // statistics rollups: then the store joins every writer (serialize) before it drops its month's
  // rollup, and a rollup rebuild takes this same lock first (rebuildStatsMonth), so a rebuild
  // never packs a summary that a store is about to replace. One order, this lock then the write
  // lock, on both sides: no deadlock.
  await q.tx(async (t) => {
    await t.run('DELETE FROM "CaseSummaryRule" WHERE "summaryId" = ?', [id]);
    await t.run('DELETE FROM "CaseSummary" WHERE "id" = ?', [id]);
    await t.run(
      `INSERT INTO "CaseSummary" ("id", "caseId", "ruleSetId", "ruleSetVersion", "inputHash", "computedAt", "caseLevel", "majorPhysiology", "episodeCount", "lowestSpo2", "highestEtco2", "lowestEtco2", "lowestRr", "capnoCoveragePct", "sedationS", "firstApneaResponseS", "analysisJson")
       VALUES (?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?, ?)`,
      [
        id,
        caseId,
        rs.id,
        rs.version,
        hash,
        now,
        s.caseLevel,
        s.majorPhysiology,
        s.episodeCount,
        s.lowestSpo2?.value ?? null,
        s.highestEtco2?.value ?? null,
        s.lowestEtco2?.value ?? null,
        s.lowestRr?.value ?? null,
        s.capnographyCoveragePct,
        s.sedationTime ? s.sedationTime.end - s.sedationTime.start : null,
        firstApnea?.responseS ?? null,
        JSON.stringify(a),
      ],
    );
    await t.insertMany('CaseSummaryRule', ['summaryId', 'caseId', 'ruleId', 'episodes', 'totalDurationS', 'maxDurationS', 'firstResponseS'], perRule);
    // A signed case's statistics row changed: drop its month's rollup for this version, which
    // the next statistics read (or the bulk operation that called this) rebuilds.
    const c = await t.get<{ status: string; unitId: string; scheduledDate: string }>('SELECT "status", "unitId", "scheduledDate" FROM "Case" WHERE "id" = ?', [caseId]);
    if (c?.status === 'signed') {
      await t.serialize();
      await t.run('DELETE FROM "StatsMonth" WHERE "ruleSetId" = ? AND "ruleSetVersion" = ? AND "unitId" = ? AND "month" = ?', [rs.id, rs.version, c.unitId, c.scheduledDate.slice(0, 7)]);
    }
  }, { only: summaryLockKey(caseId, rs) });
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
  await writeTx(client, async (tx) => {
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
  await rebuildAllStatsMonths(client, rs, now, unitId);
  return { recomputed: done };
}
