/**
 * The period report of the safety indicators (pure). For a month, quarter or year and a scope
 * of units: every indicator of a catalogue with numerator, denominator, rate and 95 % Wilson
 * interval, the previous period and the same period a year earlier with the difference and its
 * Newcombe interval, a control chart (p chart; run chart for quantiles) over the last 24
 * periods with special-cause signals, and its definition. Small cells are suppressed while the
 * report is built (lib/indicators/suppression.ts), so no raw small count ever enters the object.
 *
 * De-identified by construction: the report is built from counts and per-case numbers only and
 * carries no case id, key, name, record number, birth date or time of care — its only dates are
 * period bounds and the day it was generated. Cases appear only as opaque references, which
 * lib/db/indicatorReports adds beside (never inside) an issued report.
 */
import type { StatsRow } from '@/lib/domain/statsRow';
import type { RuleSetRef } from '@/lib/domain/ruleSet';
import { median, newcombeDifference, pChart, quantile, specialCauses, wilsonInterval, type SpecialCauseRule } from '@/lib/stats';
import { describeIndicator, type Catalogue, type Criterion, type Indicator, type IndicatorDefinition } from './catalogue';
import { formatCount, formatDifference, formatInterval, formatNumber, roundTo, unitScale } from './format';
import { periodContaining, periodsEndingWith, shiftPeriod, shortPeriod, yearEarlier, type Period } from './period';
import { DEFAULT_MIN_CELL, numeratorDisplay, suppressionOf, type Suppression } from './suppression';

export const REPORT_FORMAT = 'plateau-indicator-report/1';
/** Periods on each chart, ending with the report period. */
export const CHART_PERIODS = 24;

export interface ReportScope {
  /** Sorted unit ids. */
  unitIds: string[];
  units: { id: string; name: string }[];
  /** "Kestrel Bay Day Procedures Unit", "All units (3)", … */
  label: string;
}

/** One indicator in one period, as published. */
export interface Cell {
  period: Period;
  /**
   * Proportions: cases meeting every inclusion criterion (never suppressed). Quantiles: n, the
   * number of values (null when suppressed).
   */
  denominator: number | null;
  /** Cases with the event (proportions); null when suppressed, and always for quantiles. */
  numerator: number | null;
  /** Rate in the indicator's unit (per 100, per 1,000, %), or the quantile in seconds; null when withheld or without cases. */
  value: number | null;
  /** 95 % Wilson limits in the indicator's unit (proportions only). */
  lower: number | null;
  upper: number | null;
  suppressed: Suppression;
  display: { numerator: string; denominator: string; value: string; interval: string };
}

export interface Difference {
  /** This period minus the other, in the indicator's unit (percentage points for %). */
  estimate: number;
  /** Newcombe hybrid score limits (proportions); null for quantiles. */
  lower: number | null;
  upper: number | null;
}

export interface Comparison {
  cell: Cell;
  difference: Difference | null;
  /** "+2.1 (−3.0 to +7.2)", or why there is none. */
  display: string;
}

export interface ChartPoint {
  period: string;
  short: string;
  value: number | null;
  lcl: number | null;
  ucl: number | null;
  signals: SpecialCauseRule[];
}

export interface IndicatorChart {
  kind: 'p' | 'run';
  /** Centre line in the indicator's unit: p̄ (p chart) or the median of the plotted values (run chart). */
  centre: number | null;
  /** Why the centre line and limits are not shown, when they would give away suppressed counts. */
  withheld: string | null;
  points: ChartPoint[];
}

export interface Exclusion {
  criterion: string;
  reason: string;
  count: number;
}

export interface IndicatorResult {
  id: string;
  definition: IndicatorDefinition;
  current: Cell;
  previous: Comparison;
  yearEarlier: Comparison;
  /** Cases of the period left out of the denominator, by the first criterion they fail (activity criteria only). */
  excluded: Exclusion[];
  chart: IndicatorChart;
  /** The chart's periods as cells, oldest first; the last is `current`. */
  series: Cell[];
}

export interface IndicatorReport {
  format: typeof REPORT_FORMAT;
  catalogueVersion: number;
  ruleSet: RuleSetRef;
  period: Period;
  previousPeriod: Period;
  yearEarlierPeriod: Period;
  scope: ReportScope;
  minCell: number;
  confidence: number;
  chartPeriods: number;
  /** The day (YYYY-MM-DD) the numbers were computed. */
  generatedOn: string;
  /** Signed cases of the period in the scope (all depths). */
  cases: number;
  indicators: IndicatorResult[];
  /** Set when the report is issued (lib/db/indicatorReports). */
  issue: { reportKey: string; version: number; issuedOn: string; issuedBy: string } | null;
}

export interface BuildReportOptions {
  /** Smallest published count (default 5): counts 1 … minCell − 1 are suppressed. */
  minCell?: number;
  /** Default 0.95. */
  confidence?: number;
  /** Periods on each chart (default 24). */
  chartPeriods?: number;
}

export interface BuildReportInput {
  catalogue: Catalogue;
  period: Period;
  scope: ReportScope;
  /** The signed cases of the scope over `reportWindow(period)`; rows outside it or outside the scope are ignored. */
  rows: readonly StatsRow[];
  generatedOn: string;
  options?: BuildReportOptions;
}

/** The report key shared by every version of one period and scope. @example reportKey(parsePeriod('2026-Q3')!, ['b', 'a']) //=> '2026-Q3/a+b' */
export function reportKey(period: Period, unitIds: readonly string[]): string {
  return `${period.label}/${[...unitIds].sort().join('+')}`;
}

/** The dates whose cases a report needs: its chart window and the same period a year earlier. */
export function reportWindow(period: Period, chartPeriods: number = CHART_PERIODS): { from: string; to: string; periods: Period[] } {
  const periods = periodsEndingWith(period, chartPeriods);
  const ye = yearEarlier(period);
  return { from: ye.start < periods[0].start ? ye.start : periods[0].start, to: period.end, periods };
}

/** Raw counts of one indicator in one period (never published as such). */
interface Raw {
  x: number;
  n: number;
  values: number[];
  /** Quantiles: cases meeting every criterion but the last (the parent of n, for complementary suppression). */
  parent: number;
}

/**
 * The raw counts of several indicators in one pass over the rows: a case's data is read once
 * for every indicator (one pass per indicator costs several times more in memory traffic at
 * 100,000 cases than the tests themselves), and a criterion several indicators share (the same
 * object in the catalogue) is asked once per case. With `exclusions`, also counts, per
 * indicator, the cases failing each criterion first.
 */
function rawsOf(inds: readonly Indicator[], rows: readonly StatsRow[], exclusions?: Map<string, number>[]): Raw[] {
  const raws: Raw[] = inds.map(() => ({ x: 0, n: 0, values: [], parent: 0 }));
  const criteria: Criterion[] = [];
  const slot = new Map<Criterion, number>();
  const pops = inds.map((ind) =>
    ind.population.map((c) => {
      let i = slot.get(c);
      if (i === undefined) {
        slot.set(c, (i = criteria.length));
        criteria.push(c);
      }
      return i;
    }),
  );
  // Per case: 0 = not asked yet, 1 = holds, 2 = fails.
  const seen = new Uint8Array(criteria.length);
  const holds = (r: StatsRow, i: number) => {
    if (seen[i] === 0) seen[i] = criteria[i].test(r) ? 1 : 2;
    return seen[i] === 1;
  };
  for (const r of rows) {
    seen.fill(0);
    for (let k = 0; k < inds.length; k++) {
      const ind = inds[k];
      const raw = raws[k];
      const pop = pops[k];
      let failed = -1;
      for (let i = 0; i < pop.length - 1; i++) {
        if (!holds(r, pop[i])) {
          failed = i;
          break;
        }
      }
      if (failed === -1) raw.parent++;
      if (failed === -1 && pop.length > 0 && !holds(r, pop[pop.length - 1])) failed = pop.length - 1;
      if (failed !== -1) {
        const c = ind.population[failed];
        if (exclusions && !c.event) exclusions[k].set(c.id, (exclusions[k].get(c.id) ?? 0) + 1);
        continue;
      }
      raw.n++;
      if (ind.kind === 'proportion') {
        if (ind.numerator.test(r)) raw.x++;
      } else {
        const v = ind.value.of(r);
        if (v !== null && Number.isFinite(v)) raw.values.push(v);
      }
    }
  }
  return raws;
}

function exclusionsFrom(ind: Indicator, counts: Map<string, number>): Exclusion[] {
  return ind.population.filter((c) => !c.event).map((c) => ({ criterion: c.id, reason: c.excluded, count: counts.get(c.id) ?? 0 }));
}

function proportionCell(ind: Indicator, period: Period, raw: Raw, minCell: number, confidence: number): Cell {
  const base = { period, lower: null, upper: null };
  if (raw.n === 0) return { ...base, denominator: 0, numerator: 0, value: null, suppressed: null, display: { numerator: '0', denominator: '0', value: 'no cases', interval: '' } };
  const s = suppressionOf(raw.x, raw.n, minCell);
  const den = formatCount(raw.n);
  if (s !== null) return { ...base, denominator: raw.n, numerator: null, value: null, suppressed: s, display: { numerator: numeratorDisplay(raw.x, raw.n, s, minCell), denominator: den, value: 'suppressed', interval: '' } };
  const scale = unitScale(ind.unit);
  const w = wilsonInterval(raw.x, raw.n, { confidence });
  const value = roundTo(w.estimate * scale);
  const lower = roundTo(w.lower * scale);
  const upper = roundTo(w.upper * scale);
  return {
    period,
    denominator: raw.n,
    numerator: raw.x,
    value,
    lower,
    upper,
    suppressed: null,
    display: { numerator: formatCount(raw.x), denominator: den, value: formatNumber(value, ind.unit), interval: formatInterval(lower, upper, ind.unit) },
  };
}

function quantileCell(ind: Indicator & { kind: 'quantile' }, period: Period, raw: Raw, minCell: number): Cell {
  const n = raw.values.length;
  const base = { period, numerator: null, lower: null, upper: null };
  if (n === 0) return { ...base, denominator: 0, value: null, suppressed: null, display: { numerator: '', denominator: '0', value: 'no cases', interval: '' } };
  if (n < minCell) return { ...base, denominator: null, value: null, suppressed: 'small_n', display: { numerator: '', denominator: `< ${minCell}`, value: 'suppressed', interval: '' } };
  const value = roundTo(quantile(raw.values, ind.p));
  const complement = raw.parent - n;
  // n is published unless the cases it leaves out of its parent group are few (complementary rule).
  if (complement > 0 && complement < minCell) {
    return { ...base, denominator: null, value, suppressed: 'small_complement', display: { numerator: '', denominator: `≥ ${minCell}`, value: formatNumber(value, 'seconds'), interval: '' } };
  }
  return { ...base, denominator: n, value, suppressed: null, display: { numerator: '', denominator: formatCount(n), value: formatNumber(value, 'seconds'), interval: '' } };
}

function cellOf(ind: Indicator, period: Period, raw: Raw, minCell: number, confidence: number): Cell {
  return ind.kind === 'proportion' ? proportionCell(ind, period, raw, minCell, confidence) : quantileCell(ind, period, raw, minCell);
}

function compare(ind: Indicator, cur: { cell: Cell; raw: Raw }, other: { cell: Cell; raw: Raw }, confidence: number): Comparison {
  const none = (display: string): Comparison => ({ cell: other.cell, difference: null, display });
  if (cur.cell.value === null || other.cell.value === null) {
    const noCases = cur.cell.display.value === 'no cases' || other.cell.display.value === 'no cases';
    return none(noCases ? 'not available (no cases)' : 'not shown (suppressed)');
  }
  if (ind.kind === 'quantile') {
    const estimate = roundTo(cur.cell.value - other.cell.value);
    return { cell: other.cell, difference: { estimate, lower: null, upper: null }, display: formatDifference(estimate, null, null, ind.unit) };
  }
  const scale = unitScale(ind.unit);
  const d = newcombeDifference(cur.raw.x, cur.raw.n, other.raw.x, other.raw.n, { confidence });
  const difference = { estimate: roundTo(d.estimate * scale), lower: roundTo(d.lower * scale), upper: roundTo(d.upper * scale) };
  return { cell: other.cell, difference, display: formatDifference(difference.estimate, difference.lower, difference.upper, ind.unit) };
}

function proportionChart(ind: Indicator, series: { cell: Cell; raw: Raw }[], minCell: number): IndicatorChart {
  const scale = unitScale(ind.unit);
  const withCases = series.filter((s) => s.raw.n > 0);
  const empty = (withheld: string | null): IndicatorChart => ({
    kind: 'p',
    centre: null,
    withheld,
    points: series.map((s) => ({ period: s.cell.period.label, short: shortPeriod(s.cell.period), value: s.cell.value, lcl: null, ucl: null, signals: [] })),
  });
  if (withCases.length === 0) return empty(null);
  // The centre line is Σx/Σn over all periods and the denominators are published, so the sum
  // of the suppressed numerators could be recovered: withhold the line and limits when that
  // pooled count would itself be a small cell.
  const hidden = withCases.filter((s) => s.cell.suppressed !== null);
  if (hidden.length > 0) {
    const pooled = suppressionOf(
      hidden.reduce((a, s) => a + s.raw.x, 0),
      hidden.reduce((a, s) => a + s.raw.n, 0),
      minCell,
    );
    if (pooled !== null) return empty('centre line and limits withheld: together with the published denominators they would give away suppressed counts');
  }
  const chart = pChart(withCases.map((s) => ({ label: s.cell.period.label, x: s.raw.x, n: s.raw.n })));
  // Suppressed points take no part in the signals (set on the centre line they end any run and
  // lie inside the limits), so no published signal depends on a withheld count.
  const flagged = specialCauses({ points: chart.points.map((p, i) => (withCases[i].cell.suppressed !== null ? { ...p, value: p.centre } : p)) });
  const byLabel = new Map(flagged.map((p, i) => [p.label, { p, hidden: withCases[i].cell.suppressed !== null }]));
  return {
    kind: 'p',
    centre: roundTo(chart.centre * scale),
    withheld: null,
    points: series.map((s) => {
      const f = byLabel.get(s.cell.period.label);
      return {
        period: s.cell.period.label,
        short: shortPeriod(s.cell.period),
        value: s.cell.value,
        lcl: f ? roundTo(f.p.lcl * scale) : null,
        ucl: f ? roundTo(f.p.ucl * scale) : null,
        signals: f && !f.hidden ? f.p.rules : [],
      };
    }),
  };
}

function runChart(series: { cell: Cell }[]): IndicatorChart {
  const shown = series.map((s) => s.cell.value).filter((v): v is number => v !== null);
  const centre = shown.length ? roundTo(median(shown)) : null;
  const pts = series.map((s) => ({ label: s.cell.period.label, value: s.cell.value ?? centre ?? 0, centre: centre ?? 0, lcl: -Infinity, ucl: Infinity, excluded: false }));
  const flagged = centre === null ? null : specialCauses({ points: pts });
  return {
    kind: 'run',
    centre,
    withheld: null,
    points: series.map((s, i) => ({
      period: s.cell.period.label,
      short: shortPeriod(s.cell.period),
      value: s.cell.value,
      lcl: null,
      ucl: null,
      signals: flagged && s.cell.value !== null ? flagged[i].rules : [],
    })),
  };
}

function groupByPeriod(rows: readonly StatsRow[], kind: Period['kind'], unitIds: ReadonlySet<string>): Map<string, StatsRow[]> {
  const by = new Map<string, StatsRow[]>();
  // A year has 365 dates and 100,000 cases: the period of each date is worked out once.
  const labelOf = new Map<string, string>();
  for (const r of rows) {
    if (!unitIds.has(r.unitId)) continue;
    let label = labelOf.get(r.date);
    if (label === undefined) labelOf.set(r.date, (label = periodContaining(kind, r.date).label));
    let list = by.get(label);
    if (!list) by.set(label, (list = []));
    list.push(r);
  }
  return by;
}

function checkMinCell(minCell: number): void {
  if (!Number.isInteger(minCell) || minCell < 1) throw new RangeError(`minCell must be a whole number ≥ 1 (got ${minCell})`);
}

/**
 * Builds the period report. Pure: rows, the period, the scope and the day come in.
 *
 * @example
 * const r = buildIndicatorReport({ catalogue: getCatalogue(1), period: parsePeriod('2026-Q3')!, scope, rows, generatedOn: '2026-12-01' })
 * r.indicators.find((i) => i.id === 'hypoxemia')!.current.display //=> { numerator: '12', denominator: '240', value: '5.0', interval: '2.9–8.5' }
 */
export function buildIndicatorReport(input: BuildReportInput): IndicatorReport {
  const minCell = input.options?.minCell ?? DEFAULT_MIN_CELL;
  const confidence = input.options?.confidence ?? 0.95;
  const chartPeriods = input.options?.chartPeriods ?? CHART_PERIODS;
  checkMinCell(minCell);
  const { period, catalogue } = input;
  const { periods } = reportWindow(period, chartPeriods);
  const prev = shiftPeriod(period, -1);
  const ye = yearEarlier(period);
  const byPeriod = groupByPeriod(input.rows, period.kind, new Set(input.scope.unitIds));
  const rowsOf = (p: Period) => byPeriod.get(p.label) ?? [];
  const current = rowsOf(period);

  // Every indicator's raw counts per period, each period's rows walked once for all indicators
  // (the report period's walk also counts the exclusions).
  const exclusions = catalogue.indicators.map(() => new Map<string, number>());
  const rawsByPeriod = new Map<string, Raw[]>([[period.label, rawsOf(catalogue.indicators, current, exclusions)]]);
  const rawAt = (p: Period, k: number): Raw => {
    let raws = rawsByPeriod.get(p.label);
    if (!raws) rawsByPeriod.set(p.label, (raws = rawsOf(catalogue.indicators, rowsOf(p))));
    return raws[k];
  };
  const indicators = catalogue.indicators.map((ind, k): IndicatorResult => {
    const at = (p: Period) => {
      const raw = rawAt(p, k);
      return { raw, cell: cellOf(ind, p, raw, minCell, confidence) };
    };
    const series = periods.map(at);
    const cur = series[series.length - 1];
    const find = (p: Period) => series.find((s) => s.cell.period.label === p.label) ?? at(p);
    return {
      id: ind.id,
      definition: describeIndicator(ind, catalogue),
      current: cur.cell,
      previous: compare(ind, cur, find(prev), confidence),
      yearEarlier: compare(ind, cur, find(ye), confidence),
      excluded: exclusionsFrom(ind, exclusions[k]),
      chart: ind.kind === 'proportion' ? proportionChart(ind, series, minCell) : runChart(series),
      series: series.map((s) => s.cell),
    };
  });

  return {
    format: REPORT_FORMAT,
    catalogueVersion: catalogue.version,
    ruleSet: { ...catalogue.ruleSet },
    period,
    previousPeriod: prev,
    yearEarlierPeriod: ye,
    scope: input.scope,
    minCell,
    confidence,
    chartPeriods,
    generatedOn: input.generatedOn,
    cases: current.length,
    indicators,
    issue: null,
  };
}

/** Indicators per period over a run of periods (the JSON API for other systems): cells only. */
export interface IndicatorSeries {
  format: 'plateau-indicator-series/1';
  catalogueVersion: number;
  ruleSet: RuleSetRef;
  scope: ReportScope;
  periods: Period[];
  minCell: number;
  confidence: number;
  generatedOn: string;
  indicators: { id: string; definition: IndicatorDefinition; cells: Cell[] }[];
}

/**
 * Every indicator in every period of `periods` (same cells, suppression and intervals as the
 * report; no comparisons or charts).
 */
export function buildIndicatorSeries(input: { catalogue: Catalogue; periods: readonly Period[]; scope: ReportScope; rows: readonly StatsRow[]; generatedOn: string; options?: Omit<BuildReportOptions, 'chartPeriods'> }): IndicatorSeries {
  const minCell = input.options?.minCell ?? DEFAULT_MIN_CELL;
  const confidence = input.options?.confidence ?? 0.95;
  checkMinCell(minCell);
  const kind = input.periods[0]?.kind ?? 'month';
  const byPeriod = groupByPeriod(input.rows, kind, new Set(input.scope.unitIds));
  const raws = new Map(input.periods.map((p) => [p.label, rawsOf(input.catalogue.indicators, byPeriod.get(p.label) ?? [])]));
  return {
    format: 'plateau-indicator-series/1',
    catalogueVersion: input.catalogue.version,
    ruleSet: { ...input.catalogue.ruleSet },
    scope: input.scope,
    periods: [...input.periods],
    minCell,
    confidence,
    generatedOn: input.generatedOn,
    indicators: input.catalogue.indicators.map((ind, k) => ({
      id: ind.id,
      definition: describeIndicator(ind, input.catalogue),
      cells: input.periods.map((p) => cellOf(ind, p, raws.get(p.label)![k], minCell, confidence)),
    })),
  };
}

/**
 * The cases counted in each indicator's numerator in the report period (proportions) or
 * contributing a value (quantiles), by case id. Only for the internal reference list of an
 * issued report (lib/db); never part of the report object.
 */
export function numeratorCaseIds(catalogue: Catalogue, period: Period, unitIds: readonly string[], rows: readonly StatsRow[]): Record<string, string[]> {
  const inPeriod = groupByPeriod(rows, period.kind, new Set(unitIds)).get(period.label) ?? [];
  const out: Record<string, string[]> = {};
  for (const ind of catalogue.indicators) {
    out[ind.id] = inPeriod
      .filter((r) => ind.population.every((c) => c.test(r)) && (ind.kind === 'proportion' ? ind.numerator.test(r) : ind.value.of(r) !== null))
      .map((r) => r.caseId);
  }
  return out;
}
