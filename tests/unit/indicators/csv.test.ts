import Papa from 'papaparse';
import { describe, expect, it } from 'vitest';
import { buildIndicatorReport, buildIndicatorSeries } from '@/lib/indicators/report';
import { getCatalogue } from '@/lib/indicators/catalogue';
import { parsePeriod, periodsEndingWith } from '@/lib/indicators/period';
import { CSV_COLUMNS, reportRows, seriesRows, toCsv } from '@/lib/indicators/csv';
import { rows, SCOPE } from './_rows';

const cat = getCatalogue(1);
const SEP = parsePeriod('2026-09')!;
const data = periodsEndingWith(SEP, 24).flatMap((m) => rows(40, 8, { date: `${m.label}-12` }, { interventions: ['bag_mask'], episodes: { hypoxemia: 1 } }));

describe('the CSV export', () => {
  const report = buildIndicatorReport({ catalogue: cat, period: SEP, scope: SCOPE, rows: [...data, ...rows(40, 2, { date: '2026-09-20' }, { interventions: ['naloxone'] })], generatedOn: '2026-12-01' });
  const csv = toCsv(reportRows(report));
  const parsed = Papa.parse<Record<string, string>>(csv, { header: true, skipEmptyLines: true });

  it('has machine-readable snake_case headers and one row per indicator per chart period', () => {
    expect(parsed.errors).toEqual([]);
    expect(parsed.meta.fields).toEqual([...CSV_COLUMNS]);
    for (const f of CSV_COLUMNS) expect(f).toMatch(/^[a-z][a-z0-9_]*$/);
    expect(parsed.data).toHaveLength(cat.indicators.length * 24);
    const keys = parsed.data.map((r) => `${r.indicator_id}|${r.period}`);
    expect(new Set(keys).size).toBe(keys.length);
    expect(csv.slice(0, csv.indexOf('\n') + 1)).toMatch(/\r\n$/);
  });

  it('marks the report, previous and year-earlier rows, with the differences on the report row', () => {
    const mine = parsed.data.filter((r) => r.indicator_id === 'positive_pressure_ventilation');
    expect(mine.filter((r) => r.period_role === 'report').map((r) => r.period)).toEqual(['2026-09']);
    expect(mine.find((r) => r.period_role === 'previous')!.period).toBe('2026-08');
    expect(mine.find((r) => r.period_role === 'year_earlier')!.period).toBe('2025-09');
    const rep = mine.find((r) => r.period_role === 'report')!;
    expect(rep).toMatchObject({ numerator: '8', denominator: '80', numerator_display: '8', statistic: 'proportion', unit: 'per_1000_cases', catalogue_version: '1', rule_set_id: 'plateau-default', rule_set_version: '1', min_cell: '5' });
    expect(Number(rep.value)).toBeCloseTo(100, 6);
    expect(Number(rep.ci_lower)).toBeGreaterThan(0);
    expect(rep.diff_previous).not.toBe('');
    expect(Number(rep.chart_centre)).toBeGreaterThan(0);
  });

  it('leaves the numbers of a suppressed cell empty and says why', () => {
    const rev = parsed.data.find((r) => r.indicator_id === 'reversal_agent' && r.period_role === 'report')!;
    expect(rev).toMatchObject({ numerator: '', numerator_display: '< 5', value: '', ci_lower: '', suppressed: 'small_numerator', denominator: '80' });
  });

  it('names quantile statistics median and p90', () => {
    const stats = new Set(parsed.data.map((r) => `${r.indicator_id}:${r.statistic}`));
    expect(stats.has('apnea_response_median:median')).toBe(true);
    expect(stats.has('apnea_response_p90:p90')).toBe(true);
  });

  it('writes series rows for other systems with the same columns', () => {
    const s = buildIndicatorSeries({ catalogue: cat, periods: periodsEndingWith(SEP, 3), scope: SCOPE, rows: data, generatedOn: '2026-12-01' });
    const out = Papa.parse<Record<string, string>>(toCsv(seriesRows(s)), { header: true, skipEmptyLines: true });
    expect(out.data).toHaveLength(cat.indicators.length * 3);
    expect(new Set(out.data.map((r) => r.period_role))).toEqual(new Set(['series']));
  });

  it('keeps a spreadsheet from running a text cell as a formula', () => {
    const evil = buildIndicatorReport({ catalogue: cat, period: SEP, scope: { ...SCOPE, label: '=HYPERLINK("x")' }, rows: data, generatedOn: '2026-12-01' });
    const rowsOut = reportRows(evil).map((r) => ({ ...r, indicator_title: '=1+1' }));
    expect(toCsv(rowsOut)).toContain(`'=1+1`);
    expect(toCsv(rowsOut)).not.toMatch(/,=1\+1/);
  });
});
