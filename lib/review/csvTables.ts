import Papa from 'papaparse';
import type { StatsRow } from '@/lib/domain/statsRow';
import { LEVEL_LABEL } from '@/lib/domain/ruleLabel';
import { QUEUE_REASON_LABEL, REVIEW_CATEGORY_LABEL, REVIEW_STATUS_LABEL, type QueueReason, type ReviewCategory, type ReviewStatus } from '@/lib/domain/review';
import { REGIMEN_LABEL } from '@/lib/domain/regimen';
import type { Review } from './buildReview';
import type { Breakdown } from './breakdown';
import type { Funnel } from './funnel';
import type { ObservedExpected } from './observedExpected';
import type { Headline } from './headline';
import type { MonthlySeries } from './monthlySeries';
import type { ReviewComparison } from './compareReview';
import { DIMENSIONS, type DimensionId } from './dimensions';

/** A table as the CSV export writes it: a header row and plain values. */
export interface CsvTable {
  name: string;
  columns: string[];
  rows: (string | number | null)[][];
}

/** Tables of the review page, by export id. */
export const REVIEW_TABLES = ['headline', 'monthly', ...DIMENSIONS.map((d) => `breakdown-${d}` as const), 'funnel-proceduralist', 'funnel-nurse', 'oe-room'] as const;
export type ReviewTableId = (typeof REVIEW_TABLES)[number];

const r6 = (v: number | null | undefined) => (v === null || v === undefined || !Number.isFinite(v) ? null : Math.round(v * 1e6) / 1e6);

export function headlineTable(h: Headline): CsvTable {
  const rows: CsvTable['rows'] = [['sedated_cases', 'Sedated cases reviewed', h.cases, h.cases, null, null, null]];
  for (const f of h.figures) rows.push([f.id, f.label, f.numerator, f.denominator, r6(f.rate), r6(f.lower), r6(f.upper)]);
  const ar = h.apneaResponse;
  rows.push(['apnea_responded', 'Cases whose first apnea had a recorded response', ar.responded.numerator, ar.responded.denominator, r6(ar.responded.rate), r6(ar.responded.lower), r6(ar.responded.upper)]);
  rows.push(['apnea_response_median_s', 'Median first response to apnea (s)', null, ar.values.length, r6(ar.median.value), r6(ar.median.lower), r6(ar.median.upper)]);
  rows.push(['apnea_response_p90_s', '90th percentile of first response to apnea (s)', null, ar.values.length, r6(ar.p90.value), r6(ar.p90.lower), r6(ar.p90.upper)]);
  for (const e of h.episodeRates) rows.push([`episodes_per_1000:${e.ruleId}`, `Episodes of ${e.ruleId} per 1,000 cases`, e.episodes, e.cases, r6(e.per1000), r6(e.lower), r6(e.upper)]);
  return { name: 'headline', columns: ['figure', 'label', 'numerator', 'denominator', 'rate', 'lower_95', 'upper_95'], rows };
}

export function monthlyTable(series: readonly MonthlySeries[]): CsvTable {
  const rows: CsvTable['rows'] = [];
  for (const s of series) for (const p of s.points) rows.push([s.figure, p.month, p.x, p.n, r6(p.value), r6(p.centre), r6(p.lcl), r6(p.ucl), p.rules.join(' '), p.partial ? 'partial' : '']);
  return { name: 'monthly', columns: ['figure', 'month', 'x', 'n', 'proportion', 'centre', 'lcl_3sigma', 'ucl_3sigma', 'special_cause', 'note'], rows };
}

export function breakdownTable(b: Breakdown): CsvTable {
  const columns = [b.dimension, 'label', 'cases'];
  for (const f of b.figures) columns.push(`${f} x`, `${f} rate`, `${f} lower_95`, `${f} upper_95`);
  const line = (r: Breakdown['total']) => {
    const out: CsvTable['rows'][number] = [r.key, r.label, r.cases];
    for (const f of b.figures) out.push(r.cells[f].numerator, r6(r.cells[f].rate), r6(r.cells[f].lower), r6(r.cells[f].upper));
    return out;
  };
  return { name: `breakdown-${b.dimension}`, columns, rows: [...b.rows.map(line), line(b.total)] };
}

export function funnelTable(f: Funnel): CsvTable {
  return {
    name: `funnel-${f.by}`,
    columns: [f.by, 'label', 'x', 'n', 'proportion', 'p0', 'lower_95', 'upper_95', 'lower_99_8', 'upper_99_8', 'flag'],
    rows: f.points.map((p) => [p.key, p.label, p.x, p.n, r6(p.proportion), r6(f.p0), r6(p.limits[0]?.lower), r6(p.limits[0]?.upper), r6(p.limits[1]?.lower), r6(p.limits[1]?.upper), p.flag ?? '']),
  };
}

export function observedExpectedTable(o: ObservedExpected): CsvTable {
  const line = (r: ObservedExpected['total']) => [r.key, r.label, r.cases, r.observed, r6(r.expected), r6(r.ratio), r6(r.lower), r6(r.upper), r.casesUnrated];
  return { name: 'oe-room', columns: ['room', 'label', 'cases', 'observed', 'expected', 'ratio', 'lower_95', 'upper_95', 'cases_unrated'], rows: [...o.rooms.map(line), line(o.total)] };
}

/** One of the review page's tables by export id; undefined for an unknown id. */
export function reviewTable(review: Review, id: string): CsvTable | undefined {
  if (id === 'headline') return headlineTable(review.headline);
  if (id === 'monthly') return monthlyTable(review.trend.series);
  if (id.startsWith('breakdown-')) {
    const b = review.breakdowns.find((x) => x.dimension === (id.slice(10) as DimensionId));
    return b ? breakdownTable(b) : undefined;
  }
  if (id === 'funnel-proceduralist') return funnelTable(review.funnels.proceduralist);
  if (id === 'funnel-nurse') return funnelTable(review.funnels.nurse);
  if (id === 'oe-room') return observedExpectedTable(review.observedExpected);
  return undefined;
}

/** A case list (drill-down or queue) without patient identity: case key, date and facts. */
export function caseListTable(rows: readonly StatsRow[], extra?: (row: StatsRow) => { reasons?: QueueReason[]; status?: ReviewStatus; category?: ReviewCategory | null }): CsvTable {
  const columns = ['case', 'date', 'room', 'procedure', 'regimen', 'asa', 'planned_depth', 'proceduralist', 'nurse', 'case_level', 'major_physiology', 'episodes', 'first_apnea_response_s', 'lowest_spo2'];
  if (extra) columns.push('queue_reasons', 'review_status', 'category');
  return {
    name: 'cases',
    columns,
    rows: rows.map((r) => {
      const s = r.summary;
      const out: CsvTable['rows'][number] = [r.key ?? r.caseId, r.date, r.room, r.procedureType, REGIMEN_LABEL[r.regimen], r.asaClass, r.plannedDepth, r.proceduralist, r.nurse, s ? LEVEL_LABEL[s.caseLevel] : null, s ? (s.majorPhysiology ? 'yes' : 'no') : null, s?.episodeCount ?? null, s?.firstApneaResponseS ?? null, s?.lowestSpo2 ?? null];
      if (extra) {
        const e = extra(r);
        out.push((e.reasons ?? []).map((x) => QUEUE_REASON_LABEL[x]).join('; '), e.status ? REVIEW_STATUS_LABEL[e.status] : null, e.category ? REVIEW_CATEGORY_LABEL[e.category] : null);
      }
      return out;
    }),
  };
}

export function comparisonTable(c: ReviewComparison): CsvTable {
  const a = `${c.a.id}@${c.a.version}`;
  const b = `${c.b.id}@${c.b.version}`;
  return {
    name: 'compare',
    columns: ['figure', 'label', `${a} x`, `${a} n`, `${a} rate`, `${b} x`, `${b} n`, `${b} rate`, 'cases_only_a', 'cases_only_b'],
    rows: c.figures.map((f) => [f.id, f.label, f.a?.numerator ?? null, f.a?.denominator ?? null, r6(f.a?.rate), f.b?.numerator ?? null, f.b?.denominator ?? null, r6(f.b?.rate), f.onlyA, f.onlyB]),
  };
}

export function changedCasesTable(c: ReviewComparison): CsvTable {
  return { name: 'compare-cases', columns: ['case', 'date', 'changes'], rows: c.changedCases.map((x) => [x.key ?? x.caseId, x.date, x.changes.join('; ')]) };
}

/** The table as CSV text (papaparse `unparse`, CRLF line ends, quoted where needed). */
export function toCsv(table: CsvTable): string {
  return Papa.unparse({ fields: table.columns, data: table.rows });
}

