/**
 * Machine-readable rows of a report or series: one row per indicator per period, snake_case
 * headers, plain numbers (empty when suppressed or not applicable) beside the published display
 * strings. CSV through papaparse's unparse (RFC 4180 quoting, CRLF). Pure.
 */
import Papa from 'papaparse';
import type { Cell, IndicatorReport, IndicatorSeries } from './report';
import type { IndicatorDefinition } from './catalogue';

export const CSV_COLUMNS = [
  'report_key',
  'report_version',
  'catalogue_version',
  'rule_set_id',
  'rule_set_version',
  'scope_unit_ids',
  'period_kind',
  'period',
  'period_start',
  'period_end',
  'period_role',
  'indicator_id',
  'indicator_title',
  'statistic',
  'unit',
  'numerator',
  'numerator_display',
  'denominator',
  'denominator_display',
  'value',
  'ci_lower',
  'ci_upper',
  'suppressed',
  'min_cell',
  'diff_previous',
  'diff_previous_lower',
  'diff_previous_upper',
  'diff_year_earlier',
  'diff_year_earlier_lower',
  'diff_year_earlier_upper',
  'chart_centre',
  'chart_lcl',
  'chart_ucl',
  'chart_signals',
] as const;

export type IndicatorRow = Record<(typeof CSV_COLUMNS)[number], string | number | null>;

const UNIT_CODE = { per100: 'per_100_cases', per1000: 'per_1000_cases', percent: 'percent', seconds: 'seconds' } as const;

function statistic(d: IndicatorDefinition): string {
  if (d.kind === 'proportion' || d.p === null) return 'proportion';
  return d.p === 0.5 ? 'median' : `p${Math.round(d.p * 100)}`;
}

function baseRow(common: Pick<IndicatorRow, 'report_key' | 'report_version' | 'catalogue_version' | 'rule_set_id' | 'rule_set_version' | 'scope_unit_ids' | 'min_cell'>, d: IndicatorDefinition, c: Cell, role: string): IndicatorRow {
  return {
    ...common,
    period_kind: c.period.kind,
    period: c.period.label,
    period_start: c.period.start,
    period_end: c.period.end,
    period_role: role,
    indicator_id: d.id,
    indicator_title: d.title,
    statistic: statistic(d),
    unit: UNIT_CODE[d.unit],
    numerator: c.numerator,
    numerator_display: c.display.numerator,
    denominator: c.denominator,
    denominator_display: c.display.denominator,
    value: c.value,
    ci_lower: c.lower,
    ci_upper: c.upper,
    suppressed: c.suppressed ?? '',
    diff_previous: null,
    diff_previous_lower: null,
    diff_previous_upper: null,
    diff_year_earlier: null,
    diff_year_earlier_lower: null,
    diff_year_earlier_upper: null,
    chart_centre: null,
    chart_lcl: null,
    chart_ucl: null,
    chart_signals: '',
  };
}

/** The rows of a report: each indicator × each period of its chart window, oldest first. */
export function reportRows(r: IndicatorReport): IndicatorRow[] {
  const common = {
    report_key: r.issue?.reportKey ?? '',
    report_version: r.issue?.version ?? '',
    catalogue_version: r.catalogueVersion,
    rule_set_id: r.ruleSet.id,
    rule_set_version: r.ruleSet.version,
    scope_unit_ids: r.scope.unitIds.join(' '),
    min_cell: r.minCell,
  };
  const rows: IndicatorRow[] = [];
  for (const ind of r.indicators) {
    ind.series.forEach((c, i) => {
      const label = c.period.label;
      const role = label === r.period.label ? 'report' : label === r.previousPeriod.label ? 'previous' : label === r.yearEarlierPeriod.label ? 'year_earlier' : 'trend';
      const row = baseRow(common, ind.definition, c, role);
      const pt = ind.chart.points[i];
      row.chart_centre = ind.chart.centre;
      row.chart_lcl = pt?.lcl ?? null;
      row.chart_ucl = pt?.ucl ?? null;
      row.chart_signals = pt?.signals.join(' ') ?? '';
      if (role === 'report') {
        row.diff_previous = ind.previous.difference?.estimate ?? null;
        row.diff_previous_lower = ind.previous.difference?.lower ?? null;
        row.diff_previous_upper = ind.previous.difference?.upper ?? null;
        row.diff_year_earlier = ind.yearEarlier.difference?.estimate ?? null;
        row.diff_year_earlier_lower = ind.yearEarlier.difference?.lower ?? null;
        row.diff_year_earlier_upper = ind.yearEarlier.difference?.upper ?? null;
      }
      rows.push(row);
    });
  }
  return rows;
}

/** The rows of a series (JSON API / CSV for other systems): each indicator × each period. */
export function seriesRows(s: IndicatorSeries): IndicatorRow[] {
  const common = {
    report_key: '',
    report_version: '',
    catalogue_version: s.catalogueVersion,
    rule_set_id: s.ruleSet.id,
    rule_set_version: s.ruleSet.version,
    scope_unit_ids: s.scope.unitIds.join(' '),
    min_cell: s.minCell,
  };
  return s.indicators.flatMap((ind) => ind.cells.map((c) => baseRow(common, ind.definition, c, 'series')));
}

/**
 * CSV text with a header row. Text cells starting with = + @ or a tab are prefixed with ' so a
 * spreadsheet does not run them as formulas (numbers are left alone).
 */
export function toCsv(rows: readonly IndicatorRow[]): string {
  return Papa.unparse(
    { fields: [...CSV_COLUMNS], data: rows.map((r) => CSV_COLUMNS.map((c) => r[c] ?? '')) },
    { newline: '\r\n', escapeFormulae: /^[=+@\t\r]/ },
  );
}
