import { randomUUID } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { appendAudit } from './audit';
import { ConflictError, NotFoundError } from './cases';
import { loadStatsRows } from './statsRows';
import { sqlOf } from './client';
import { SEP, unpack } from './caseRollup';
import type { SqlValue } from './sql';
import { activeRuleSet, refreshSummary } from './summaries';
import type { StatsRow } from '@/lib/domain/statsRow';
import type { RuleSet, RuleSetRef } from '@/lib/domain/ruleSet';
import type { Analysis } from '@/lib/domain/episode';
import { INTERVENTION_LABEL, INTERVENTION_LEVEL, type InterventionKind, type Level } from '@/lib/domain/intervention';
import type { QueueReason, ReviewCategory, ReviewInput, ReviewStatus } from '@/lib/domain/review';
import { ruleLabel } from '@/lib/domain/ruleLabel';
import { regimenOf } from '@/lib/domain/regimen';
import type { StratumCount } from '@/lib/stats';
import {
  buildReview,
  compareReview,
  describeCaseFilter,
  dimensionValue,
  focusFigure,
  queueReasons,
  referencePeriod,
  reviewQueue,
  selectCases,
  stratumKey,
  trendFigures,
  trendMonths,
  type CaseFilter,
  type FigureDef,
  type FigureId,
  type MonthCount,
  type Review,
  type ReviewComparison,
  type ReviewPeriod,
} from '@/lib/review';
import { writeTx } from './tx';

/** The unit as the review needs it: its review limit and the rule set its screens use. */
export interface ReviewUnit {
  id: string;
  name: string;
  timeZone: string;
  reviewResponseLimitS: number;
  ruleSet: RuleSet;
}

export async function reviewUnit(client: PrismaClient, unitId: string): Promise<ReviewUnit | null> {
  const u = await client.unit.findUnique({ where: { id: unitId }, select: { id: true, name: true, timeZone: true, reviewResponseLimitS: true } });
  if (!u) return null;
  return { ...u, ruleSet: await activeRuleSet(client, u.id) };
}

const ruleIdsOf = (rs: RuleSet) => rs.rules.map((r) => r.id);
const refOf = (rs: RuleSet): RuleSetRef => ({ id: rs.id, version: rs.version });

function rowsFor(client: PrismaClient, unit: ReviewUnit, from: string, to: string, rs: RuleSet = unit.ruleSet): Promise<StatsRow[]> {
  return loadStatsRows(client, { unitIds: [unit.id], from, to, ruleSetId: rs.id, ruleSetVersion: rs.version });
}

export interface ReviewRecordView {
  id: string;
  status: ReviewStatus;
  category: ReviewCategory | null;
  comment: string | null;
  followUp: string | null;
  reviewer: string | null;
  updatedAt: string;
  version: number;
}

async function reviewsFor(client: PrismaClient, caseIds: string[]): Promise<Map<string, ReviewRecordView>> {
  if (caseIds.length === 0) return new Map();
  const reviews = [];
  // SQLite caps bound parameters; page the lookup.
  for (let i = 0; i < caseIds.length; i += 500) reviews.push(...(await client.caseReview.findMany({ where: { caseId: { in: caseIds.slice(i, i + 500) } } })));
  const reviewerIds = [...new Set(reviews.map((r) => r.reviewerId).filter((x): x is string => !!x))];
  const users = reviewerIds.length ? await client.user.findMany({ where: { id: { in: reviewerIds } }, select: { id: true, displayName: true } }) : [];
  const names = new Map(users.map((u) => [u.id, u.displayName]));
  return new Map(
    reviews.map((r) => [
      r.caseId,
      { id: r.id, status: r.status as ReviewStatus, category: (r.category as ReviewCategory | null) ?? null, comment: r.comment, followUp: r.followUp, reviewer: r.reviewerId ? (names.get(r.reviewerId) ?? null) : null, updatedAt: r.updatedAt.toISOString(), version: r.version },
    ]),
  );
}

/**
 * A figure as a SQL condition over `c` ("Case") and `s` (its CaseSummary): the same question
 * lib/review's figure asks of a StatsRow (tests/integration/review.test.ts checks they agree).
 */
function figureSql(id: FigureId, responseLimitS: number): { sql: string; args: SqlValue[] } {
  const limit = Number(responseLimitS);
  if (!Number.isFinite(limit)) throw new Error('responseLimitS must be a number');
  const supported = `s."caseLevel" IN ('supported', 'rescued')`;
  if (id === 'any_episode') return { sql: 's."episodeCount" > 0', args: [] };
  if (id === 'supported_or_above') return { sql: supported, args: [] };
  if (id === 'major_physiology') return { sql: 's."majorPhysiology" = TRUE', args: [] };
  if (id === 'apnea_response_over_limit') return { sql: `s."firstApneaResponseS" > ${limit}`, args: [] };
  if (id === 'in_review_queue') return { sql: `(${supported} OR s."majorPhysiology" = TRUE OR s."firstApneaResponseS" > ${limit})`, args: [] };
  if (id.startsWith('level:')) return { sql: 's."caseLevel" = ?', args: [id.slice(6)] };
  if (id.startsWith('rule:')) return { sql: 'EXISTS (SELECT 1 FROM "CaseSummaryRule" sr WHERE sr."summaryId" = s."id" AND sr."ruleId" = ? AND sr."episodes" > 0)', args: [id.slice(5)] };
  throw new Error(`no SQL for figure ${id}`);
}

const REVIEWED_CASES = `FROM "Case" c JOIN "CaseSummary" s ON s."caseId" = c."id" AND s."ruleSetId" = ? AND s."ruleSetVersion" = ?
  WHERE c."unitId" = ? AND c."status" = 'signed' AND c."scheduledDate" >= ? AND c."scheduledDate" <= ?`;

/**
 * Month-by-month counts of several figures in one aggregate query over the summary tables
 * (no rows leave the database), for the trend charts.
 */
export async function monthlyFigureCounts(client: PrismaClient, unit: ReviewUnit, rs: RuleSet, from: string, to: string, figures: readonly FigureDef[]): Promise<Record<FigureId, MonthCount[]>> {
  const parts = figures.map((f) => figureSql(f.id, unit.reviewResponseLimitS));
  const rows = await sqlOf(client).all<Record<string, unknown>>(
    `SELECT substr(c."scheduledDate", 1, 7) AS "month", COUNT(*) AS "n"${parts.map((p, i) => `, SUM(CASE WHEN ${p.sql} THEN 1 ELSE 0 END) AS "x${i}"`).join('')}
     ${REVIEWED_CASES} GROUP BY substr(c."scheduledDate", 1, 7) ORDER BY 1`,
    [...parts.flatMap((p) => p.args), rs.id, rs.version, unit.id, from, to],
  );
  const out: Record<FigureId, MonthCount[]> = {};
  figures.forEach((f, i) => (out[f.id] = rows.map((r) => ({ month: String(r.month), n: Number(r.n), x: Number(r[`x${i}`] ?? 0) }))));
  return out;
}

/** Cases and cases with the figure per ASA × procedure × regimen stratum, counted in SQL (regimen from the doses, as StatsRow has it). */
export async function referenceStrata(client: PrismaClient, unit: ReviewUnit, rs: RuleSet, period: ReviewPeriod, figure: FigureDef): Promise<StratumCount[]> {
  const f = figureSql(figure.id, unit.reviewResponseLimitS);
  const rows = await sqlOf(client).all<{ asa: string | null; proc: string; drugs: string | null; hit: unknown; n: unknown }>(
    `SELECT c."asaClass" AS "asa", c."procedureType" AS "proc",
       (SELECT string_agg(d."drug", ? ORDER BY d."at", d."id") FROM "Dose" d WHERE d."caseId" = c."id" AND d."voidedAt" IS NULL) AS "drugs",
       CASE WHEN ${f.sql} THEN 1 ELSE 0 END AS "hit", COUNT(*) AS "n"
     ${REVIEWED_CASES} GROUP BY 1, 2, 3, 4`,
    [SEP, ...f.args, rs.id, rs.version, unit.id, period.from, period.to],
  );
  const strata = new Map<string, StratumCount>();
  for (const r of rows) {
    const key = stratumKey(r.asa, r.proc, regimenOf(unpack(r.drugs)));
    let c = strata.get(key);
    if (!c) strata.set(key, (c = { stratum: key, x: 0, n: 0 }));
    c.n += Number(r.n);
    if (Number(r.hit) === 1) c.x += Number(r.n);
  }
  return [...strata.values()];
}

/**
 * The monthly review of a period under the unit's rule set: the period's rows (lib/db
 * statsRows), the trend's monthly counts and the reference period's stratum counts (aggregate
 * SQL), then lib/review `buildReview`; plus how much of the review queue is still to review.
 */
export async function loadReview(
  client: PrismaClient,
  unit: ReviewUnit,
  q: { period: ReviewPeriod; focus?: string },
): Promise<{ review: Review; ruleSet: RuleSetRef; queue: { cases: number; toReview: number } }> {
  const reference = referencePeriod(q.period);
  const ruleIds = ruleIdsOf(unit.ruleSet);
  const limit = unit.reviewResponseLimitS;
  const months = trendMonths(q.period);
  const [rows, trend, strata] = await Promise.all([
    rowsFor(client, unit, q.period.from, q.period.to),
    monthlyFigureCounts(client, unit, unit.ruleSet, `${months[0]}-01`, q.period.to, trendFigures(ruleIds, limit)),
    referenceStrata(client, unit, unit.ruleSet, reference, focusFigure(q.focus, ruleIds, limit)),
  ]);
  const review = buildReview(rows, { trend, referenceStrata: strata }, { period: q.period, reference, ruleIds, responseLimitS: limit, focus: q.focus });
  const queued = reviewQueue(rows, { responseLimitS: limit }).map((e) => e.row.caseId);
  const reviews = await reviewsFor(client, queued);
  const toReview = queued.filter((id) => reviews.get(id)?.status !== 'reviewed').length;
  return { review, ruleSet: refOf(unit.ruleSet), queue: { cases: queued.length, toReview } };
}

/** The cases behind a number on the review pages (drill-down), with their review status. */
export async function loadReviewCases(
  client: PrismaClient,
  unit: ReviewUnit,
  q: { period: ReviewPeriod; filter: CaseFilter },
): Promise<{ rows: StatsRow[]; description: string; reviews: Map<string, ReviewRecordView>; reasons: Map<string, QueueReason[]> }> {
  const all = await rowsFor(client, unit, q.period.from, q.period.to);
  const opts = { ruleIds: ruleIdsOf(unit.ruleSet), responseLimitS: unit.reviewResponseLimitS };
  const rows = selectCases(all, q.filter, opts);
  const valueLabel = q.filter.dim && q.filter.value !== undefined ? all.map((r) => dimensionValue(r, q.filter.dim!)).find((v) => v.key === q.filter.value)?.label : undefined;
  const reviews = await reviewsFor(client, rows.map((r) => r.caseId));
  const reasons = new Map(rows.map((r) => [r.caseId, queueReasons(r, opts)]));
  return { rows, description: describeCaseFilter(q.filter, opts, valueLabel), reviews, reasons };
}

export interface QueueItem {
  row: StatsRow;
  reasons: QueueReason[];
  review: ReviewRecordView | null;
}

/** The review queue of a period: cases that meet the queue rule, with the lead's review when recorded. */
export async function loadReviewQueue(client: PrismaClient, unit: ReviewUnit, q: { period: ReviewPeriod; status?: ReviewStatus }): Promise<QueueItem[]> {
  const rows = await rowsFor(client, unit, q.period.from, q.period.to);
  const entries = reviewQueue(rows, { responseLimitS: unit.reviewResponseLimitS });
  const reviews = await reviewsFor(client, entries.map((e) => e.row.caseId));
  return entries
    .map((e) => ({ row: e.row, reasons: e.reasons, review: reviews.get(e.row.caseId) ?? null }))
    .filter((i) => !q.status || (i.review?.status ?? 'to_review') === q.status);
}

/** Seconds either side of an episode that its chart segment shows. */
export const EPISODE_MARGIN_S = 120;
/** Spacing of the sample table under each episode chart. */
export const SAMPLE_TABLE_STEP_S = 5;

export interface TimelineEntry {
  t: number;
  kind: 'event' | 'dose' | 'intervention' | 'episode';
  label: string;
  level?: Level;
  /** For episodes: the index into `episodes`. */
  episode?: number;
}

export interface EpisodeSegment {
  index: number;
  rule: string;
  label: string;
  start: number;
  end: number;
  durationS: number;
  censored: boolean;
  level: Level;
  responseS: number | null;
  onsetAbrupt: boolean | null;
  extremes: Analysis['episodes'][number]['extremes'];
  lastDose: string | null;
  window: { from: number; to: number };
  /** Monitor samples in the window (s from case start; EtCO2 in mmHg), per channel. */
  series: Record<string, { t: number[]; v: number[] }>;
  /** Episodes (of any rule) overlapping the window, for shading. */
  shaded: { rule: string; start: number; end: number }[];
  markers: { t: number; label: string; kind: 'dose' | 'intervention' | 'event' }[];
  /** One row per SAMPLE_TABLE_STEP_S seconds: the first sample of each channel in that step. */
  samples: { t: number; etco2: number | null; rr: number | null; spo2: number | null; hr: number | null }[];
  doses: { t: number; label: string }[];
  interventions: { t: number; label: string; level: Level }[];
}

export interface ReviewCaseData {
  case: {
    id: string;
    key: string | null;
    date: string;
    startAt: string;
    status: string;
    room: string | null;
    procedureType: string;
    plannedDepth: string;
    reachedDepth: string | null;
    asaClass: string | null;
    asaEmergency: boolean;
    ageYears: number | null;
    sex: string;
    regimen: StatsRow['regimen'] | null;
    proceduralist: string | null;
    nurse: string | null;
    etco2Unit: 'mmHg' | 'kPa';
    timeZone: string;
  };
  ruleSet: RuleSetRef;
  activeRuleSet: RuleSetRef;
  analysis: Analysis | null;
  queueReasons: QueueReason[];
  review: ReviewRecordView | null;
  timeline: TimelineEntry[];
  episodes: EpisodeSegment[];
}

const EVENT_LABEL: Record<string, string> = {
  sedation_start: 'Sedation start',
  procedure_start: 'Procedure start',
  procedure_end: 'Procedure end',
  recovery_start: 'Recovery start',
  discharge: 'Discharge',
  sedation_end: 'Sedation end',
};

/**
 * One case as the review's drill-down shows it: facts, the analysis under a rule set (stored
 * summary, computed when missing), the timeline of events, doses, interventions and episodes,
 * and each episode's chart segment (± 2 min) with the samples, doses and interventions around it.
 */
export async function loadReviewCase(client: PrismaClient, unit: ReviewUnit, caseId: string, now: Date, ruleSet: RuleSet = unit.ruleSet): Promise<ReviewCaseData | null> {
  const c = await client.case.findUnique({
    where: { id: caseId },
    include: {
      patient: { select: { birthDate: true, sex: true } },
      room: { select: { name: true } },
      proceduralist: { select: { name: true } },
      nurse: { select: { displayName: true } },
      doses: { where: { voidedAt: null }, orderBy: { at: 'asc' } },
      interventions: { where: { voidedAt: null }, orderBy: { at: 'asc' } },
      events: { where: { voidedAt: null }, orderBy: { at: 'asc' } },
    },
  });
  if (!c || c.unitId !== unit.id) return null;
  const stored = await client.caseSummary.findUnique({ where: { caseId_ruleSetId_ruleSetVersion: { caseId, ruleSetId: ruleSet.id, ruleSetVersion: ruleSet.version } }, select: { analysisJson: true } });
  const parsed = stored ? (JSON.parse(stored.analysisJson) as Partial<Analysis>) : null;
  // A stored analysis without its episodes or summary is not usable evidence: compute it again.
  const analysis = parsed && Array.isArray(parsed.episodes) && parsed.summary ? (parsed as Analysis) : await refreshSummary(client, caseId, now, ruleSet);
  const [row] = (await rowsFor(client, unit, c.scheduledDate, c.scheduledDate, ruleSet).then((rs) => rs.filter((r) => r.caseId === caseId))) as (StatsRow | undefined)[];
  const startMs = c.startAt.getTime();
  const sec = (d: Date) => (d.getTime() - startMs) / 1000;
  const samples = await client.sample.findMany({ where: { caseId, source: 'monitor', probeOff: false }, orderBy: [{ channel: 'asc' }, { atMs: 'asc' }], select: { channel: true, atMs: true, value: true } });
  const doses = c.doses.map((d) => ({ t: sec(d.at), label: `${d.drug} ${d.amount} ${d.unit} ${d.route}` }));
  const interventions = c.interventions.map((i) => ({ t: sec(i.at), label: INTERVENTION_LABEL[i.kind as InterventionKind] ?? i.kind, level: (INTERVENTION_LEVEL[i.kind as InterventionKind] ?? 'corrected') as Level }));
  const events = c.events.map((e) => ({ t: sec(e.at), label: EVENT_LABEL[e.kind] ?? e.kind }));
  const episodes = analysis?.episodes ?? [];
  const timeline: TimelineEntry[] = [
    ...events.map((e) => ({ t: e.t, kind: 'event' as const, label: e.label })),
    ...doses.map((d) => ({ t: d.t, kind: 'dose' as const, label: d.label })),
    ...interventions.map((i) => ({ t: i.t, kind: 'intervention' as const, label: i.label, level: i.level })),
    ...episodes.map((e, i) => ({ t: e.start, kind: 'episode' as const, label: `${ruleLabel(e.rule)} began (${Math.round(e.durationS)} s${e.censored ? ', censored' : ''})`, level: e.level, episode: i })),
  ].sort((a, b) => a.t - b.t);
  const byChannel = new Map<string, { t: number[]; v: number[] }>();
  for (const s of samples) {
    let ch = byChannel.get(s.channel);
    if (!ch) byChannel.set(s.channel, (ch = { t: [], v: [] }));
    ch.t.push((s.atMs - startMs) / 1000);
    ch.v.push(s.value);
  }
  const segments: EpisodeSegment[] = episodes.map((e, index) => {
    const from = e.start - EPISODE_MARGIN_S;
    const to = e.end + EPISODE_MARGIN_S;
    const series: EpisodeSegment['series'] = {};
    const table = new Map<number, EpisodeSegment['samples'][number]>();
    for (const [channel, s] of byChannel) {
      const out = { t: [] as number[], v: [] as number[] };
      for (let i = lowerBound(s.t, from); i < s.t.length && s.t[i] <= to; i++) {
        out.t.push(s.t[i]);
        out.v.push(s.v[i]);
        if (channel === 'etco2' || channel === 'rr' || channel === 'spo2' || channel === 'hr') {
          const step = Math.floor(s.t[i] / SAMPLE_TABLE_STEP_S) * SAMPLE_TABLE_STEP_S;
          let r = table.get(step);
          if (!r) table.set(step, (r = { t: step, etco2: null, rr: null, spo2: null, hr: null }));
          if (r[channel] === null) r[channel] = s.v[i];
        }
      }
      series[channel] = out;
    }
    const inWindow = <T extends { t: number }>(xs: T[]) => xs.filter((x) => x.t >= from && x.t <= to);
    return {
      index,
      rule: e.rule,
      label: ruleLabel(e.rule),
      start: e.start,
      end: e.end,
      durationS: e.durationS,
      censored: e.censored,
      level: e.level,
      responseS: e.responseS,
      onsetAbrupt: e.onsetAbrupt,
      extremes: e.extremes,
      lastDose: e.lastSedativeDose ? `${e.lastSedativeDose.drug} ${e.lastSedativeDose.amount} ${e.lastSedativeDose.unit}, ${Math.round(e.sinceLastSedativeDoseS ?? 0)} s before` : null,
      window: { from, to },
      series,
      shaded: episodes.filter((x) => x.start < to && x.end > from).map((x) => ({ rule: x.rule, start: x.start, end: x.end })),
      markers: [
        ...inWindow(doses).map((d) => ({ t: d.t, label: d.label, kind: 'dose' as const })),
        ...inWindow(interventions).map((i) => ({ t: i.t, label: i.label, kind: 'intervention' as const })),
        ...inWindow(events).map((x) => ({ t: x.t, label: x.label, kind: 'event' as const })),
      ],
      samples: [...table.values()].sort((a, b) => a.t - b.t),
      doses: inWindow(doses),
      interventions: inWindow(interventions),
    };
  });
  const reviews = await reviewsFor(client, [caseId]);
  return {
    case: {
      id: c.id,
      key: c.key,
      date: c.scheduledDate,
      startAt: c.startAt.toISOString(),
      status: c.status,
      room: c.room?.name ?? null,
      procedureType: c.procedureType,
      plannedDepth: c.plannedDepth,
      reachedDepth: c.reachedDepth,
      asaClass: c.asaClass,
      asaEmergency: c.asaEmergency,
      ageYears: row?.ageYears ?? null,
      sex: c.patient.sex,
      regimen: row?.regimen ?? null,
      proceduralist: c.proceduralist?.name ?? null,
      nurse: c.nurse?.displayName ?? null,
      etco2Unit: c.etco2Unit === 'kPa' ? 'kPa' : 'mmHg',
      timeZone: unit.timeZone,
    },
    ruleSet: refOf(ruleSet),
    activeRuleSet: refOf(unit.ruleSet),
    analysis,
    queueReasons: row ? queueReasons(row, { responseLimitS: unit.reviewResponseLimitS }) : [],
    review: reviews.get(caseId) ?? null,
    timeline,
    episodes: segments,
  };
}

function lowerBound(xs: number[], x: number): number {
  let lo = 0;
  let hi = xs.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (xs[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/** A review edit made against a version someone else has since replaced. */
export class StaleReviewError extends ConflictError {}

/**
 * Records the lead's review of a case with optimistic concurrency: `input.version` must be the
 * stored version (0 when there is none yet); a stale one throws StaleReviewError and saves
 * nothing. The change and its audit entry commit in one transaction. Saving the same content
 * again changes nothing.
 */
export async function recordReview(
  client: PrismaClient,
  caseId: string,
  input: ReviewInput,
  actor: { id: string; role: string; origin: string | null },
  now: Date,
): Promise<{ review: ReviewRecordView; changed: boolean }> {
  const data = { status: input.status, category: input.category ?? null, comment: input.comment?.trim() || null, followUp: input.followUp?.trim() || null };
  try {
    const saved = await writeTx(client, async (tx) => {
      const c = await tx.case.findUnique({ where: { id: caseId }, select: { id: true } });
      if (!c) throw new NotFoundError(`case ${caseId} not found`);
      const existing = await tx.caseReview.findUnique({ where: { caseId } });
      if (!existing) {
        if (input.version !== 0) throw new StaleReviewError('version: this case has no review yet; reload the page and enter it again');
        const created = await tx.caseReview.create({ data: { id: randomUUID(), caseId, ...data, reviewerId: actor.id, version: 1, createdAt: now, updatedAt: now } });
        await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'create', entity: 'case_review', entityId: created.id, caseId, after: { ...data, version: 1 }, origin: actor.origin });
        return { id: created.id, changed: true };
      }
      if (existing.version !== input.version) {
        const by = existing.reviewerId ? await tx.user.findUnique({ where: { id: existing.reviewerId }, select: { displayName: true } }) : null;
        throw new StaleReviewError(
          `version: this review was saved by ${by?.displayName ?? 'someone else'} at ${existing.updatedAt.toISOString()} (version ${existing.version}) after you opened it (version ${input.version}). Nothing was saved: reload to see their review, then make your change again.`,
        );
      }
      const before = { status: existing.status, category: existing.category, comment: existing.comment, followUp: existing.followUp };
      if (JSON.stringify(before) === JSON.stringify(data)) return { id: existing.id, changed: false };
      const updated = await tx.caseReview.updateMany({ where: { id: existing.id, version: input.version }, data: { ...data, reviewerId: actor.id, version: input.version + 1, updatedAt: now } });
      if (updated.count !== 1) throw new StaleReviewError('version: this review was changed at the same moment; reload and try again. Nothing was saved.');
      await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'update', entity: 'case_review', entityId: existing.id, caseId, before: { ...before, version: existing.version }, after: { ...data, version: input.version + 1 }, origin: actor.origin });
      return { id: existing.id, changed: true };
    });
    const view = (await reviewsFor(client, [caseId])).get(caseId)!;
    return { review: view, changed: saved.changed };
  } catch (e) {
    if (e && typeof e === 'object' && 'code' in e && (e as { code: unknown }).code === 'P2002') throw new StaleReviewError('version: another review of this case was saved at the same moment; reload and try again. Nothing was saved.');
    throw e;
  }
}

/** The most cases a rule-set comparison computes summaries for (the period must stay bounded). */
export const MAX_COMPARE_CASES = 2000;

async function missingSummaries(client: PrismaClient, unit: ReviewUnit, period: ReviewPeriod, rs: RuleSet): Promise<{ total: number; missing: string[] }> {
  const where = { unitId: unit.id, status: 'signed', scheduledDate: { gte: period.from, lte: period.to } };
  const [total, missing] = await Promise.all([
    client.case.count({ where }),
    client.case.findMany({ where: { ...where, summaries: { none: { ruleSetId: rs.id, ruleSetVersion: rs.version } } }, select: { id: true }, orderBy: [{ scheduledDate: 'asc' }, { startAt: 'asc' }] }),
  ]);
  return { total, missing: missing.map((m) => m.id) };
}

/**
 * Computes up to `limit` of the period's missing summaries under rule set `rs` (stored keyed by
 * version, so a second comparison is fast). Returns what is left, for a progress bar.
 */
export async function computeMissingSummaries(
  client: PrismaClient,
  unit: ReviewUnit,
  q: { period: ReviewPeriod; ruleSet: RuleSet; limit: number; now: Date },
): Promise<{ total: number; computed: number; remaining: number }> {
  const { total, missing } = await missingSummaries(client, unit, q.period, q.ruleSet);
  if (total > MAX_COMPARE_CASES) throw new ConflictError(`from: the period has ${total} cases; compare at most ${MAX_COMPARE_CASES} at a time (choose a shorter period)`);
  const batch = missing.slice(0, q.limit);
  for (const id of batch) await refreshSummary(client, id, q.now, q.ruleSet);
  return { total, computed: batch.length, remaining: missing.length - batch.length };
}

/**
 * The period under the unit's rule set (A) and another (B), side by side (lib/review
 * `compareReview`), with how many of B's summaries are still to compute.
 */
export async function loadComparison(
  client: PrismaClient,
  unit: ReviewUnit,
  q: { period: ReviewPeriod; other: RuleSet },
): Promise<{ comparison: ReviewComparison; total: number; missing: number }> {
  const [{ total, missing }, rowsA, rowsB] = await Promise.all([
    missingSummaries(client, unit, q.period, q.other),
    rowsFor(client, unit, q.period.from, q.period.to),
    rowsFor(client, unit, q.period.from, q.period.to, q.other),
  ]);
  const comparison = compareReview(rowsA, rowsB, { a: refOf(unit.ruleSet), b: refOf(q.other), responseLimitS: unit.reviewResponseLimitS, ruleIdsA: ruleIdsOf(unit.ruleSet), ruleIdsB: ruleIdsOf(q.other) });
  return { comparison, total, missing: missing.length };
}
