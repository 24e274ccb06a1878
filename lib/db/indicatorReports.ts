/**
 * Safety-indicator reports in the database: the live (draft) report of a period and scope,
 * issuing a frozen version, the list of issued versions, exports (PDF, CSV, JSON) and the
 * resolution of opaque case references. Every issue, export and resolution is audited.
 *
 * Freeze: an issued version is one IssuedReport row whose resultJson holds the report exactly as
 * issued; nothing here updates or deletes it. A re-run is a new version (same reportKey,
 * version + 1) with diffJson listing the published differences from the version before.
 */
import { randomBytes, randomUUID } from 'node:crypto';
import type { PrismaClient } from './generated/client';
import { loadStatsRows } from './statsRows';
import { appendAudit } from './audit';
import { localDate } from '@/lib/_shared/time';
import {
  buildIndicatorReport,
  buildIndicatorSeries,
  diffReports,
  getCatalogue,
  numeratorCaseIds,
  parsePeriod,
  periodsBetween,
  publishedFingerprint,
  reportKey,
  reportRows,
  reportWindow,
  seriesRows,
  toCsv,
  DEFAULT_MIN_CELL,
  type IndicatorReport,
  type IndicatorRow,
  type IndicatorSeries,
  type Period,
  type PeriodKind,
  type ReportDiff,
  type ReportScope,
} from '@/lib/indicators';
import { renderReportPdf } from '@/lib/indicators/pdf';
import { writeTx } from './tx';

/** Bad input that names its field (→ 422). */
export class ReportInputError extends Error {
  constructor(
    public field: string,
    message: string,
  ) {
    super(`${field}: ${message}`);
  }
}
/** No such issued report or reference (→ 404). */
export class ReportNotFoundError extends Error {}
/** The request cannot be done in the current state (→ 409). */
export class ReportConflictError extends Error {}

export interface ReportActor {
  id: string;
  role: string;
  displayName: string;
  origin: string | null;
}

/**
 * The site's smallest published count: PLATEAU_REPORT_MIN_CELL (a whole number ≥ 2), default 5.
 * A report may ask for a larger cell size, never a smaller one.
 */
export function configuredMinCell(env: NodeJS.ProcessEnv = process.env): number {
  const n = Number(env.PLATEAU_REPORT_MIN_CELL);
  return Number.isInteger(n) && n >= 2 ? n : DEFAULT_MIN_CELL;
}

export interface ReportRequest {
  /** `2026-07`, `2026-Q3` or `2026`. */
  period: string;
  /** `all`, or unit ids. */
  scope: 'all' | string[];
  minCell?: number;
}

interface Resolved {
  period: Period;
  scope: ReportScope;
  minCell: number;
  timeZone: string;
}

export async function listUnits(client: PrismaClient): Promise<{ id: string; name: string; timeZone: string }[]> {
  return client.unit.findMany({ select: { id: true, name: true, timeZone: true }, orderBy: [{ name: 'asc' }, { id: 'asc' }] });
}

async function resolveScope(client: PrismaClient, scope: 'all' | string[]): Promise<{ scope: ReportScope; timeZone: string }> {
  const units = await listUnits(client);
  if (units.length === 0) throw new ReportConflictError('scope: no unit is set up yet');
  const byId = new Map(units.map((u) => [u.id, u]));
  const ids = scope === 'all' ? units.map((u) => u.id) : [...new Set(scope)];
  if (ids.length === 0) throw new ReportInputError('scope', 'choose at least one unit');
  for (const id of ids) if (!byId.has(id)) throw new ReportInputError('scope', `unknown unit ${JSON.stringify(id)}`);
  ids.sort();
  const chosen = ids.map((id) => byId.get(id)!);
  const label = chosen.length === 1 ? chosen[0].name : chosen.length === units.length ? `All units (${chosen.length})` : chosen.map((u) => u.name).join(', ');
  return { scope: { unitIds: ids, units: chosen.map((u) => ({ id: u.id, name: u.name })), label }, timeZone: chosen[0].timeZone };
}

function resolveMinCell(asked: number | undefined, floor: number): number {
  if (asked === undefined) return floor;
  if (!Number.isInteger(asked) || asked < floor) throw new ReportInputError('minCell', `must be a whole number ≥ ${floor} (the site's smallest published count)`);
  return asked;
}

async function resolve(client: PrismaClient, req: ReportRequest, minCellFloor: number): Promise<Resolved> {
  const period = parsePeriod(req.period);
  if (!period) throw new ReportInputError('period', 'must be a month (YYYY-MM), a quarter (YYYY-Qn) or a year (YYYY)');
  const { scope, timeZone } = await resolveScope(client, req.scope);
  return { period, scope, minCell: resolveMinCell(req.minCell, minCellFloor), timeZone };
}

async function compute(client: PrismaClient, r: Resolved, now: Date) {
  const catalogue = getCatalogue();
  const { from, to } = reportWindow(r.period);
  const rows = await loadStatsRows(client, { from, to, ruleSetId: catalogue.ruleSet.id, ruleSetVersion: catalogue.ruleSet.version, unitIds: r.scope.unitIds });
  const today = localDate(now, r.timeZone);
  const report = buildIndicatorReport({ catalogue, period: r.period, scope: r.scope, rows, generatedOn: today, options: { minCell: r.minCell } });
  return { catalogue, rows, report, today };
}

/** The live (not issued) report of a period and scope. */
export async function computeReport(client: PrismaClient, req: ReportRequest, now: Date, minCellFloor: number = DEFAULT_MIN_CELL): Promise<IndicatorReport> {
  return (await compute(client, await resolve(client, req, minCellFloor), now)).report;
}

const CROCKFORD = '0123456789ABCDEFGHJKMNPQRSTVWXYZ';

/** An opaque reference: random (not derived from any id), e.g. `R-7K2P9QXM`. */
function newRef(): string {
  const b = randomBytes(5);
  let bits = 0n;
  for (const x of b) bits = (bits << 8n) | BigInt(x);
  let s = '';
  for (let i = 0; i < 8; i++) s = CROCKFORD[Number((bits >> BigInt(5 * i)) & 31n)] + s;
  return `R-${s}`;
}

export interface IssueResult {
  id: string;
  reportKey: string;
  version: number;
  diff: ReportDiff | null;
}

/**
 * Issues the report of a period and scope as a new frozen version. Refuses a period that has not
 * ended, and a re-issue whose published numbers equal the latest version's.
 */
export async function issueReport(client: PrismaClient, req: ReportRequest, actor: ReportActor, now: Date, minCellFloor: number = DEFAULT_MIN_CELL): Promise<IssueResult> {
  const r = await resolve(client, req, minCellFloor);
  const { catalogue, rows, report, today } = await compute(client, r, now);
  if (r.period.end >= today) throw new ReportConflictError(`period: ${r.period.label} has not ended yet (last day ${r.period.end}); issue it once it is over`);
  const key = reportKey(r.period, r.scope.unitIds);
  const members = numeratorCaseIds(catalogue, r.period, r.scope.unitIds, rows);
  const refOf = new Map<string, string>();
  const used = new Set<string>();
  for (const ids of Object.values(members)) {
    for (const caseId of ids) {
      if (refOf.has(caseId)) continue;
      let ref = newRef();
      while (used.has(ref)) ref = newRef();
      used.add(ref);
      refOf.set(caseId, ref);
    }
  }
  const refs = Object.fromEntries(Object.entries(members).map(([ind, ids]) => [ind, ids.map((id) => refOf.get(id)!).sort()]));
  try {
    return await writeTx(client, async (tx) => {
      const latest = await tx.issuedReport.findFirst({ where: { reportKey: key }, orderBy: { version: 'desc' } });
      const version = (latest?.version ?? 0) + 1;
      const issued: IndicatorReport = { ...report, issue: { reportKey: key, version, issuedOn: today, issuedBy: actor.displayName } };
      let diff: ReportDiff | null = null;
      if (latest) {
        const before = (JSON.parse(latest.resultJson) as StoredResult).report;
        if (publishedFingerprint(before) === publishedFingerprint(issued)) {
          throw new ReportConflictError(`report: version ${latest.version} already publishes these numbers; nothing new to issue`);
        }
        diff = diffReports(before, issued, latest.version, version);
      }
      const id = randomUUID();
      const stored: StoredResult = { report: issued, refs };
      await tx.issuedReport.create({
        data: {
          id,
          reportKey: key,
          version,
          periodKind: r.period.kind,
          periodStart: r.period.start,
          periodEnd: r.period.end,
          scope: JSON.stringify(r.scope.unitIds),
          catalogueVersion: catalogue.version,
          ruleSetId: catalogue.ruleSet.id,
          ruleSetVersion: catalogue.ruleSet.version,
          resultJson: JSON.stringify(stored),
          diffJson: diff ? JSON.stringify(diff) : null,
          issuedById: actor.id,
          issuedAt: now,
        },
      });
      if (refOf.size > 0) await tx.reportCaseRef.createMany({ data: [...refOf].map(([caseId, ref]) => ({ reportId: id, ref, caseId })) });
      await appendAudit(tx, {
        at: now,
        actorId: actor.id,
        role: actor.role,
        action: 'issue',
        entity: 'indicator_report',
        entityId: id,
        after: { reportKey: key, version, catalogueVersion: catalogue.version, ruleSet: catalogue.ruleSet, minCell: r.minCell, refs: refOf.size, changes: diff?.changes.length ?? null },
        origin: actor.origin,
      });
      return { id, reportKey: key, version, diff };
    });
  } catch (e) {
    // two officers issuing at once: the unique (reportKey, version) lets one through
    if (e instanceof Error && /Unique constraint/i.test(e.message)) throw new ReportConflictError('report: another version was issued at the same moment; reload and try again');
    throw e;
  }
}

/** What resultJson holds: the report as issued, and the opaque references of each indicator's counted cases (internal only). */
interface StoredResult {
  report: IndicatorReport;
  refs: Record<string, string[]>;
}

export interface IssuedSummary {
  id: string;
  reportKey: string;
  version: number;
  period: Period;
  scopeLabel: string;
  unitIds: string[];
  catalogueVersion: number;
  ruleSet: { id: string; version: number };
  issuedOn: string;
  issuedAt: string;
  issuedBy: string;
  /** Published differences from the version before; null for version 1. */
  changes: number | null;
}

type IssuedRow = Awaited<ReturnType<PrismaClient['issuedReport']['findFirstOrThrow']>>;

function summaryOf(row: IssuedRow, stored: StoredResult): IssuedSummary {
  const diff = row.diffJson ? (JSON.parse(row.diffJson) as ReportDiff) : null;
  return {
    id: row.id,
    reportKey: row.reportKey,
    version: row.version,
    period: stored.report.period,
    scopeLabel: stored.report.scope.label,
    unitIds: JSON.parse(row.scope) as string[],
    catalogueVersion: row.catalogueVersion,
    ruleSet: { id: row.ruleSetId, version: row.ruleSetVersion },
    issuedOn: stored.report.issue?.issuedOn ?? '',
    issuedAt: row.issuedAt.toISOString(),
    issuedBy: stored.report.issue?.issuedBy ?? '',
    changes: diff ? diff.changes.length : null,
  };
}

/** Issued versions, newest period first, then newest version first. */
export async function listIssuedReports(client: PrismaClient, filter: { reportKey?: string } = {}): Promise<IssuedSummary[]> {
  const rows = await client.issuedReport.findMany({
    where: filter.reportKey ? { reportKey: filter.reportKey } : {},
    orderBy: [{ periodStart: 'desc' }, { reportKey: 'asc' }, { version: 'desc' }],
  });
  return rows.map((row) => summaryOf(row, JSON.parse(row.resultJson) as StoredResult));
}

export interface IssuedReportView {
  summary: IssuedSummary;
  report: IndicatorReport;
  diff: ReportDiff | null;
  /** Opaque references per indicator (for a lead to resolve inside Plateau; never exported); null unless asked for. */
  refs: Record<string, string[]> | null;
  /** Every version of the same period and scope, newest first. */
  versions: IssuedSummary[];
}

/** One issued version; `withRefs` adds the case references (only for those who may resolve them). */
export async function getIssuedReport(client: PrismaClient, id: string, options: { withRefs?: boolean } = {}): Promise<IssuedReportView> {
  const row = await client.issuedReport.findUnique({ where: { id } });
  if (!row) throw new ReportNotFoundError(`report: no issued report ${id}`);
  const stored = JSON.parse(row.resultJson) as StoredResult;
  return {
    summary: summaryOf(row, stored),
    report: stored.report,
    diff: row.diffJson ? (JSON.parse(row.diffJson) as ReportDiff) : null,
    refs: options.withRefs ? stored.refs : null,
    versions: await listIssuedReports(client, { reportKey: row.reportKey }),
  };
}

export type ExportFormat = 'pdf' | 'csv' | 'json';

export interface PdfFonts {
  font: Uint8Array;
  fontBold?: Uint8Array;
}

export interface ExportFile {
  body: Uint8Array;
  contentType: string;
  filename: string;
}

const CONTENT_TYPE: Record<ExportFormat, string> = { pdf: 'application/pdf', csv: 'text/csv; charset=utf-8', json: 'application/json; charset=utf-8' };

async function render(report: IndicatorReport, format: ExportFormat, fonts: () => PdfFonts): Promise<Uint8Array> {
  if (format === 'pdf') return renderReportPdf(report, fonts());
  const text = format === 'csv' ? toCsv(reportRows(report)) : JSON.stringify(report, null, 2) + '\n';
  return new TextEncoder().encode(text);
}

function fileName(report: IndicatorReport, format: ExportFormat): string {
  const scope = report.scope.unitIds.length > 3 ? `${report.scope.unitIds.length}-units` : report.scope.unitIds.join('+');
  const version = report.issue ? `v${report.issue.version}` : 'draft';
  return `plateau-indicators-${report.period.label}-${scope}-${version}.${format}`.replace(/[^A-Za-z0-9._+-]/g, '_');
}

async function auditExport(client: PrismaClient, actor: ReportActor, now: Date, entityId: string | null, after: unknown) {
  await writeTx(client, async (tx) => {
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'export', entity: entityId ? 'indicator_report' : 'indicator_draft', entityId, after, origin: actor.origin });
  });
}

/** An issued version as a file, rendered from its frozen numbers. */
export async function exportIssuedReport(client: PrismaClient, id: string, format: ExportFormat, fonts: () => PdfFonts, actor: ReportActor, now: Date): Promise<ExportFile> {
  const row = await client.issuedReport.findUnique({ where: { id }, select: { resultJson: true, reportKey: true, version: true } });
  if (!row) throw new ReportNotFoundError(`report: no issued report ${id}`);
  const report = (JSON.parse(row.resultJson) as StoredResult).report;
  const body = await render(report, format, fonts);
  await auditExport(client, actor, now, id, { format, reportKey: row.reportKey, version: row.version });
  return { body, contentType: CONTENT_TYPE[format], filename: fileName(report, format) };
}

/** The live (draft) report as a file. */
export async function exportDraftReport(client: PrismaClient, req: ReportRequest, format: ExportFormat, fonts: () => PdfFonts, actor: ReportActor, now: Date, minCellFloor: number = DEFAULT_MIN_CELL): Promise<ExportFile> {
  const report = await computeReport(client, req, now, minCellFloor);
  const body = await render(report, format, fonts);
  await auditExport(client, actor, now, null, { format, period: report.period.label, scope: report.scope.unitIds, minCell: report.minCell });
  return { body, contentType: CONTENT_TYPE[format], filename: fileName(report, format) };
}

export interface SeriesRequest {
  from: string;
  to: string;
  periodKind: PeriodKind;
  scope: 'all' | string[];
  minCell?: number;
}

/** Every indicator in every whole period between two dates (JSON for other systems), audited as an export. */
export async function indicatorSeriesExport(client: PrismaClient, q: SeriesRequest, actor: ReportActor, now: Date, minCellFloor: number = DEFAULT_MIN_CELL): Promise<IndicatorSeries & { rows: IndicatorRow[] }> {
  if (q.from > q.to) throw new ReportInputError('from', `must not be after to (${q.from} > ${q.to})`);
  const periods = periodsBetween(q.periodKind, q.from, q.to);
  if (periods.length === 0) throw new ReportInputError('to', `no whole ${q.periodKind} lies between ${q.from} and ${q.to}`);
  if (periods.length > 120) throw new ReportInputError('from', `at most 120 periods at once (asked for ${periods.length})`);
  const { scope, timeZone } = await resolveScope(client, q.scope);
  const minCell = resolveMinCell(q.minCell, minCellFloor);
  const catalogue = getCatalogue();
  const rows = await loadStatsRows(client, { from: periods[0].start, to: periods[periods.length - 1].end, ruleSetId: catalogue.ruleSet.id, ruleSetVersion: catalogue.ruleSet.version, unitIds: scope.unitIds });
  const series = buildIndicatorSeries({ catalogue, periods, scope, rows, generatedOn: localDate(now, timeZone), options: { minCell } });
  await auditExport(client, actor, now, null, { format: 'json-series', from: q.from, to: q.to, periodKind: q.periodKind, scope: scope.unitIds, minCell });
  return { ...series, rows: seriesRows(series) };
}

/** Resolves an opaque reference of an issued report to its case (audited: it re-identifies). */
export async function resolveReportRef(client: PrismaClient, reportId: string, ref: string, actor: ReportActor, now: Date): Promise<{ caseId: string }> {
  const row = await client.reportCaseRef.findUnique({ where: { reportId_ref: { reportId, ref } }, select: { caseId: true } });
  if (!row) throw new ReportNotFoundError(`ref: no reference ${ref} in report ${reportId}`);
  await writeTx(client, async (tx) => {
    await appendAudit(tx, { at: now, actorId: actor.id, role: actor.role, action: 'resolve_ref', entity: 'report_case_ref', entityId: reportId, caseId: row.caseId, after: { ref }, origin: actor.origin });
  });
  return { caseId: row.caseId };
}
