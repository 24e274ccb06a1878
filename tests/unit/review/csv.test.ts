import { describe, expect, it } from 'vitest';
import Papa from 'papaparse';
import { breakdownTable, buildReview, countsFromRows, caseListTable, headlineTable, monthPeriod, referencePeriod, reviewTable, toCsv, REVIEW_TABLES, casesHref, parseCaseFilter } from '@/lib/review';
import { row, RULES } from './_rows';

const period = monthPeriod('2026-11');
const reference = referencePeriod(period);
const rows = [row({ episodes: { apnea: 1 }, regimen: 'propofol_opioid' }), row({ regimen: 'propofol' }), row({ episodes: { hypoxemia: 1 }, nurse: 'Nurse "Quote", B', nurseId: 'n-b' })];
const options = { period, reference, ruleIds: RULES, responseLimitS: 60 };
const review = buildReview(rows, countsFromRows(rows, [row({ date: '2026-08-10' })], options), options);

describe('CSV exports', () => {
  it('has a table for every export id of the review page', () => {
    for (const id of REVIEW_TABLES) expect(reviewTable(review, id), id).toBeDefined();
    expect(reviewTable(review, 'breakdown-nonsense')).toBeUndefined();
  });

  it('writes CSV that papaparse reads back to the same header and values, quotes and commas included', () => {
    const t = breakdownTable(review.breakdowns.find((b) => b.dimension === 'nurse')!);
    const parsed = Papa.parse<string[]>(toCsv(t), { skipEmptyLines: true }).data;
    expect(parsed[0]).toEqual(t.columns);
    expect(parsed.slice(1).map((r) => r[1])).toContain('Nurse "Quote", B');
    expect(parsed).toHaveLength(t.rows.length + 1);
  });

  it('exports a breakdown whose rows sum to its total row', () => {
    const t = breakdownTable(review.breakdowns.find((b) => b.dimension === 'regimen')!);
    const cases = t.columns.indexOf('cases');
    const body = t.rows.slice(0, -1);
    expect(body.reduce((a, r) => a + Number(r[cases]), 0)).toBe(Number(t.rows.at(-1)![cases]));
  });

  it('exports the headline with numerators and denominators', () => {
    const t = headlineTable(review.headline);
    const apnea = t.rows.find((r) => r[0] === 'rule:apnea')!;
    expect(apnea.slice(2, 4)).toEqual([1, 3]);
  });

  it('exports case lists without patient names', () => {
    const t = caseListTable(rows);
    expect(t.columns).not.toContain('patient');
    expect(t.rows[0][0]).toBe(rows[0].key);
  });
});

describe('drill-down links', () => {
  it('carry the filter of a number to its case list and back', () => {
    const href = casesHref(period, { figure: 'rule:apnea', dim: 'proceduralist', value: 'dr-a' });
    const params = Object.fromEntries(new URL(href, 'http://x').searchParams);
    expect(params).toMatchObject({ month: '2026-11' });
    expect(href).toBe('/review/cases?month=2026-11&figure=rule:apnea&dim=proceduralist&value=dr-a');
    expect(casesHref({ from: '2026-11-03', to: '2026-11-20' }, {})).toBe('/review/cases?from=2026-11-03&to=2026-11-20');
    expect(parseCaseFilter(params)).toEqual({ figure: 'rule:apnea', dim: 'proceduralist', value: 'dr-a' });
    expect(parseCaseFilter({ dim: 'shoe-size', value: '9', figure: 'x; drop' })).toEqual({});
  });
});
