import { describe, expect, it } from 'vitest';
import { buildIndicatorReport, buildIndicatorSeries, reportKey, reportWindow, type IndicatorReport } from '@/lib/indicators/report';
import { getCatalogue } from '@/lib/indicators/catalogue';
import { parsePeriod, periodsEndingWith } from '@/lib/indicators/period';
import { reportRows, toCsv } from '@/lib/indicators/csv';
import type { StatsRow } from '@/lib/domain/statsRow';
import { row, rows, SCOPE } from './_rows';

const cat = getCatalogue(1);
const SEP = parsePeriod('2026-09')!;

function build(data: StatsRow[], period = SEP, minCell?: number): IndicatorReport {
  return buildIndicatorReport({ catalogue: cat, period, scope: SCOPE, rows: data, generatedOn: '2026-12-01', options: minCell === undefined ? {} : { minCell } });
}
const get = (r: IndicatorReport, id: string) => r.indicators.find((i) => i.id === id)!;
/** `n` sedation cases in a month, `x` of them with a bag-mask ventilation. */
const ppv = (date: string, n: number, x: number) => rows(n, x, { date }, { interventions: ['bag_mask'] });

describe('rates and 95 % Wilson intervals on constructed data', () => {
  // Newcombe RG 1998, Two-sided confidence intervals for the single proportion: comparison of
  // seven methods, Stat Med 17:857-872, Table II (Wilson score, method 3): 81/263 → 0.2553–0.3662
  // and 15/148 → 0.0624–0.1605. The indicator is per 1,000 cases, so the limits are × 1000.
  const r = build([...ppv('2026-09-10', 263, 81), ...ppv('2026-08-10', 148, 15)]);
  const ind = get(r, 'positive_pressure_ventilation');

  it('gives 81/263 with Wilson limits 255.3–366.2 per 1,000 (Newcombe 1998, Table II)', () => {
    expect(ind.current.numerator).toBe(81);
    expect(ind.current.denominator).toBe(263);
    expect(ind.current.value!).toBeCloseTo((81 / 263) * 1000, 6);
    expect(ind.current.lower!).toBeCloseTo(255.3, 1);
    expect(ind.current.upper!).toBeCloseTo(366.2, 1);
    expect(ind.current.display).toEqual({ numerator: '81', denominator: '263', value: '308.0', interval: '255.3–366.2' });
  });

  it('gives the previous month 15/148 with Wilson limits 62.4–160.5 per 1,000 (Newcombe 1998, Table II)', () => {
    expect(r.previousPeriod.label).toBe('2026-08');
    expect(ind.previous.cell.numerator).toBe(15);
    expect(ind.previous.cell.denominator).toBe(148);
    expect(ind.previous.cell.lower!).toBeCloseTo(62.4, 1);
    expect(ind.previous.cell.upper!).toBeCloseTo(160.5, 1);
  });

  it('gives the difference this period minus previous with the hybrid score limits built from the two Wilson intervals', () => {
    const c = ind.current;
    const p = ind.previous.cell;
    const d = ind.previous.difference!;
    // Newcombe 1998 (Stat Med 17:873-890) method 10: D − √((p1 − l1)² + (u2 − p2)²), D + √((u1 − p1)² + (p2 − l2)²)
    expect(d.estimate).toBeCloseTo(c.value! - p.value!, 4);
    expect(d.lower!).toBeCloseTo(d.estimate - Math.hypot(c.value! - c.lower!, p.upper! - p.value!), 4);
    expect(d.upper!).toBeCloseTo(d.estimate + Math.hypot(c.upper! - c.value!, p.value! - p.lower!), 4);
    expect(d.lower!).toBeGreaterThan(0);
  });

  it('reports the same month a year earlier as having no cases, without a difference', () => {
    expect(r.yearEarlierPeriod.label).toBe('2025-09');
    expect(ind.yearEarlier.cell.denominator).toBe(0);
    expect(ind.yearEarlier.difference).toBeNull();
    expect(ind.yearEarlier.display).toBe('not available (no cases)');
  });
});

describe('comparison with a year earlier on constructed data', () => {
  it('gives 56/70 − 48/80 = 0.2 with the Newcombe hybrid interval 0.0524 to 0.3339, × 1000 (Newcombe 1998, Stat Med 17:873-890, example a, method 10; values from memory, as docs/stats.md)', () => {
    const r = build([...ppv('2026-09-03', 70, 56), ...ppv('2025-09-03', 80, 48)]);
    const ind = get(r, 'positive_pressure_ventilation');
    expect(ind.yearEarlier.cell.display.numerator).toBe('48');
    expect(ind.yearEarlier.difference!.estimate).toBeCloseTo(200, 6);
    expect(ind.yearEarlier.difference!.lower!).toBeCloseTo(52.4, 1);
    expect(ind.yearEarlier.difference!.upper!).toBeCloseTo(333.9, 1);
    expect(ind.yearEarlier.display).toBe('+200.0 (+52.4 to +333.9)');
    expect(ind.previous.display).toBe('not available (no cases)');
  });

  it('a percentage indicator differs in percentage points', () => {
    const r = build([...rows(100, 90, { date: '2026-09-01' }, {}).map((x, i) => (i >= 90 ? { ...x, documentation: { ...x.documentation, weight: false } } : x)), ...rows(100, 100, { date: '2026-08-01' }, {}).map((x, i) => (i >= 80 ? { ...x, documentation: { ...x.documentation, weight: false } } : x))]);
    const ind = get(r, 'documentation_complete');
    expect(ind.current.display.value).toBe('90.0');
    expect(ind.previous.cell.display.value).toBe('80.0');
    expect(ind.previous.difference!.estimate).toBeCloseTo(10, 6);
  });
});

describe('small-cell suppression', () => {
  const cell = (n: number, x: number, minCell?: number) => get(build(ppv('2026-09-02', n, x), SEP, minCell), 'positive_pressure_ventilation').current;

  it('shows 1 to 4 cases with the event as "< 5" and withholds the rate and interval; the denominator stays', () => {
    for (const x of [1, 2, 3, 4]) {
      const c = cell(120, x);
      expect(c.suppressed).toBe('small_numerator');
      expect(c.numerator).toBeNull();
      expect(c.value).toBeNull();
      expect(c.lower).toBeNull();
      expect(c.display).toEqual({ numerator: '< 5', denominator: '120', value: 'suppressed', interval: '' });
    }
  });

  it('shows 5 cases and shows zero with its interval (0/120: upper limit z²/(n + z²) = 31.0 per 1,000)', () => {
    expect(cell(120, 5).display.numerator).toBe('5');
    const zero = cell(120, 0);
    expect(zero.suppressed).toBeNull();
    expect(zero.display.numerator).toBe('0');
    expect(zero.lower).toBe(0);
    expect(zero.upper!).toBeCloseTo((1000 * 1.959964 ** 2) / (120 + 1.959964 ** 2), 2);
  });

  it('suppresses a small complement: 116/120 leaves 4 cases without the event, shown as "> 115"', () => {
    const c = cell(120, 116);
    expect(c.suppressed).toBe('small_complement');
    expect(c.display.numerator).toBe('> 115');
    expect(c.value).toBeNull();
    expect(cell(120, 120).display.numerator).toBe('120');
  });

  it('withholds the numerator of a denominator below the cell size, even a zero', () => {
    expect(cell(4, 0).suppressed).toBe('small_denominator');
    expect(cell(4, 0).display.numerator).toBe('–');
    expect(cell(4, 0).denominator).toBe(4);
  });

  it('takes the cell size as an option: 7/120 is suppressed at 10, shown at 5; at 1 nothing is suppressed', () => {
    expect(cell(120, 7, 10).display.numerator).toBe('< 10');
    expect(cell(120, 7).display.numerator).toBe('7');
    expect(cell(120, 1, 1).display.numerator).toBe('1');
    expect(() => build([], SEP, 0)).toThrow(RangeError);
  });

  it('never shows a difference that involves a suppressed cell', () => {
    const r = build([...ppv('2026-09-01', 120, 3), ...ppv('2026-08-01', 120, 30)]);
    const ind = get(r, 'positive_pressure_ventilation');
    expect(ind.previous.difference).toBeNull();
    expect(ind.previous.display).toBe('not shown (suppressed)');
  });
});

describe('quantile indicators (apnoea onset to first intervention)', () => {
  const apnea = (date: string, responses: (number | null)[]) => responses.map((s) => row({ date, episodes: { apnea: 1 }, firstApneaResponseS: s }));
  const med = (data: StatsRow[]) => get(build(data), 'apnea_response_median').current;
  const p90 = (data: StatsRow[]) => get(build(data), 'apnea_response_p90').current;

  it('gives the median 30 s and the 90th percentile 46 s of 10, 20, 30, 40, 50 (type 7: 40 + 0.6 × 10)', () => {
    const data = [...apnea('2026-09-05', [50, 10, 40, 20, 30]), ...rows(20, 0, { date: '2026-09-05' }, {})];
    expect(med(data)).toMatchObject({ value: 30, denominator: 5, suppressed: null });
    expect(p90(data).value).toBeCloseTo(46, 9);
  });

  it('withholds the statistic and n below 5 values', () => {
    expect(med(apnea('2026-09-05', [10, 20, 30, 40]))).toMatchObject({ value: null, denominator: null, suppressed: 'small_n', display: { denominator: '< 5', value: 'suppressed' } });
  });

  it('shows n only as a bound when 1–4 apnoea cases had no recorded response (the complement of n)', () => {
    const one = med(apnea('2026-09-05', [10, 20, 30, 40, 50, null]));
    expect(one).toMatchObject({ value: 30, denominator: null, suppressed: 'small_complement', display: { denominator: '≥ 5', value: '30' } });
    const five = med(apnea('2026-09-05', [10, 20, 30, 40, 50, null, null, null, null, null]));
    expect(five).toMatchObject({ value: 30, denominator: 5, suppressed: null });
  });
});

describe('the control chart over 24 periods', () => {
  const months = periodsEndingWith(SEP, 24);

  it('spans the 24 months ending with the report month; p̄ = Σx/Σn; a spike is outside its 3-sigma limits', () => {
    const data = months.flatMap((m) => ppv(`${m.label}-10`, 100, m.label === '2025-06' ? 40 : 10));
    const ch = get(build(data), 'positive_pressure_ventilation').chart;
    expect(ch.kind).toBe('p');
    expect(ch.points.map((p) => p.period)).toEqual(months.map((m) => m.label));
    expect(ch.centre!).toBeCloseTo(((23 * 10 + 40) / 2400) * 1000, 6);
    const p = 270 / 2400;
    expect(ch.points[0].ucl!).toBeCloseTo((p + 3 * Math.sqrt((p * (1 - p)) / 100)) * 1000, 6);
    expect(ch.points[0].lcl!).toBeCloseTo((p - 3 * Math.sqrt((p * (1 - p)) / 100)) * 1000, 6);
    const flagged = ch.points.filter((x) => x.signals.includes('outsideLimits')).map((x) => x.period);
    expect(flagged).toEqual(['2025-06']);
  });

  it('marks runs of 8 or more on one side of the centre line', () => {
    const data = months.flatMap((m, i) => ppv(`${m.label}-10`, 100, i < 16 ? 8 : 14));
    const ch = get(build(data), 'positive_pressure_ventilation').chart;
    expect(ch.centre!).toBeCloseTo(100, 6);
    expect(ch.points.every((x) => x.signals.includes('sameSideRun'))).toBe(true);
  });

  it('withholds the centre line and limits when one suppressed period could be recovered from them', () => {
    const data = months.flatMap((m) => ppv(`${m.label}-10`, 100, m.label === '2025-01' ? 3 : 10));
    const ch = get(build(data), 'positive_pressure_ventilation').chart;
    expect(ch.centre).toBeNull();
    expect(ch.withheld).toMatch(/withheld/);
    expect(ch.points.every((x) => x.lcl === null && x.ucl === null && x.signals.length === 0)).toBe(true);
    expect(ch.points.find((x) => x.period === '2025-01')!.value).toBeNull();
    expect(ch.points.find((x) => x.period === '2025-02')!.value).toBe(100);
  });

  it('shows the centre when the suppressed periods pool to ≥ 5, and suppressed periods take no part in the signals', () => {
    // 16 low months then 8 high ones, with one suppressed month in each stretch (2 + 3 = 5 pooled)
    const x = (i: number) => (i === 4 ? 2 : i === 19 ? 3 : i < 16 ? 8 : 14);
    const data = months.flatMap((m, i) => ppv(`${m.label}-10`, 100, x(i)));
    const ch = get(build(data), 'positive_pressure_ventilation').chart;
    expect(ch.centre).not.toBeNull();
    expect(ch.points[4].value).toBeNull();
    expect(ch.points[4].signals).toEqual([]);
    // months 1–4 are a run of 4 (broken by the suppressed month), 6–16 a run of 11
    expect(ch.points.slice(0, 4).every((p) => p.signals.length === 0)).toBe(true);
    expect(ch.points.slice(5, 16).every((p) => p.signals.includes('sameSideRun'))).toBe(true);
    // the high stretch is cut in two (3 + 4) by the suppressed month: no run of 8
    expect(ch.points.slice(16).every((p) => !p.signals.includes('sameSideRun'))).toBe(true);
  });

  it('draws quantiles on a run chart around the median of the shown values', () => {
    const data = months.flatMap((m, i) => [10, 20, 30, 40, 50].map((s) => row({ date: `${m.label}-10`, episodes: { apnea: 1 }, firstApneaResponseS: s + (i % 2) })));
    const ch = get(build(data), 'apnea_response_median').chart;
    expect(ch.kind).toBe('run');
    expect(ch.centre).toBeCloseTo(30.5, 6);
    expect(ch.points.every((p) => p.lcl === null && p.ucl === null)).toBe(true);
  });
});

describe('exclusions, scope and window', () => {
  it('counts the cases left out by the first criterion they fail, and never publishes event criteria', () => {
    const data = [
      ...rows(2, 0, { date: '2026-09-04', depth: 'general' }, {}),
      ...rows(3, 0, { date: '2026-09-04', noSummary: true }, {}),
      ...rows(4, 0, { date: '2026-09-04', capno: 0 }, {}),
      ...rows(30, 0, { date: '2026-09-04' }, {}),
    ];
    const r = build(data);
    expect(r.cases).toBe(39);
    expect(get(r, 'apnea').excluded).toEqual([
      { criterion: 'sedation', reason: expect.any(String), count: 2 },
      { criterion: 'summary', reason: expect.any(String), count: 3 },
      { criterion: 'capnography_monitored', reason: expect.any(String), count: 4 },
    ]);
    expect(get(r, 'apnea').current.denominator).toBe(30);
    expect(get(r, 'apnea_response_median').excluded.map((e) => e.criterion)).toEqual(['sedation', 'summary', 'capnography_monitored']);
  });

  it('ignores rows outside the scope', () => {
    const data = [...ppv('2026-09-01', 50, 10), ...rows(50, 50, { date: '2026-09-01', unitId: 'unit-b' }, { interventions: ['bag_mask'] })];
    expect(get(build(data), 'positive_pressure_ventilation').current.display.numerator).toBe('10');
  });

  it('asks the loader for the chart window and the year-earlier period, and keys versions by period and scope', () => {
    expect(reportWindow(parsePeriod('2026-Q3')!)).toMatchObject({ from: '2020-10-01', to: '2026-09-30' });
    expect(reportWindow(parsePeriod('2026-09')!, 6)).toMatchObject({ from: '2025-09-01', to: '2026-09-30' });
    expect(reportKey(parsePeriod('2026-Q3')!, ['b', 'a'])).toBe('2026-Q3/a+b');
  });

  it('builds a series of whole periods with the same cells as the report', () => {
    const data = [...ppv('2026-08-01', 60, 6), ...ppv('2026-09-01', 80, 8)];
    const s = buildIndicatorSeries({ catalogue: cat, periods: [parsePeriod('2026-08')!, SEP], scope: SCOPE, rows: data, generatedOn: '2026-12-01' });
    const ind = s.indicators.find((i) => i.id === 'positive_pressure_ventilation')!;
    expect(ind.cells.map((c) => c.display.numerator)).toEqual(['6', '8']);
    expect(ind.cells[1]).toEqual(get(build(data), 'positive_pressure_ventilation').current);
  });
});

describe('de-identified by construction', () => {
  it('carries no case id, key, room, nurse or proceduralist name — in the object, its JSON or its CSV', () => {
    const months = periodsEndingWith(SEP, 24);
    const data = months.flatMap((m) => [...ppv(`${m.label}-10`, 30, 6), row({ date: `${m.label}-11`, episodes: { apnea: 1 }, firstApneaResponseS: 12 })]);
    const r = build(data);
    const json = JSON.stringify(r);
    const csv = toCsv(reportRows(r));
    for (const text of [json, csv]) {
      expect(text).not.toMatch(/secret/i);
      expect(text).not.toMatch(/case-|KEY-/);
    }
    const keys = new Set<string>();
    const walk = (o: unknown) => {
      if (!o || typeof o !== 'object') return;
      for (const [k, v] of Object.entries(o)) {
        keys.add(k);
        walk(v);
      }
    };
    walk(r);
    for (const k of ['caseId', 'key', 'nurse', 'nurseId', 'proceduralist', 'room', 'date', 'ageYears', 'sex']) expect(keys.has(k), k).toBe(false);
  });
});
