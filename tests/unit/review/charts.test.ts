import { describe, expect, it } from 'vitest';
import { funnelPlot, indirectStandardisation, pChart, specialCauses } from '@/lib/stats';
import { findFigure, funnelBy, monthlySeries, observedExpectedByRoom, stratumOf } from '@/lib/review';
import { row, RULES } from './_rows';

const apnea = findFigure('rule:apnea', RULES, 60)!;
const months = (counts: [string, number, number][]) => counts.flatMap(([m, x, n]) => Array.from({ length: n }, (_, i) => row({ date: `${m}-05`, episodes: { apnea: i < x ? 1 : 0 } })));

describe('the monthly p chart of a figure', () => {
  it('is lib/stats pChart over the months with cases, with their special-cause marks', () => {
    const data: [string, number, number][] = [['2026-06', 5, 50], ['2026-07', 4, 40], ['2026-08', 6, 55], ['2026-09', 20, 45], ['2026-10', 5, 50]];
    const s = monthlySeries(months(data), apnea, ['2026-05', ...data.map((d) => d[0])]);
    const ref = specialCauses(pChart(data.map(([label, x, n]) => ({ label, x, n }))));
    expect(s.points[0]).toMatchObject({ month: '2026-05', n: 0, value: null, centre: null, rules: [] });
    expect(s.centre).toBeCloseTo(40 / 240, 12);
    s.points.slice(1).forEach((p, i) => {
      expect(p).toMatchObject({ x: ref[i].x, n: ref[i].n, rules: ref[i].rules });
      expect(p.ucl).toBeCloseTo(ref[i].ucl, 12);
      expect(p.lcl).toBeCloseTo(ref[i].lcl, 12);
    });
    expect(s.points.find((p) => p.month === '2026-09')?.rules).toEqual(['outsideLimits']);
  });

  it('flags the last month as partial when the period ends inside it, and ignores rows outside the months', () => {
    const s = monthlySeries([...months([['2026-11', 1, 3]]), row({ date: '2025-01-01' })], apnea, ['2026-11'], ['2026-11']);
    expect(s.points).toHaveLength(1);
    expect(s.points[0]).toMatchObject({ n: 3, x: 1, partial: true });
  });
});

describe('funnel plots by person', () => {
  const rows = [
    ...Array.from({ length: 30 }, (_, i) => row({ proceduralistId: 'dr-a', proceduralist: 'Dr A', episodes: { apnea: i < 3 ? 1 : 0 } })),
    ...Array.from({ length: 20 }, (_, i) => row({ proceduralistId: 'dr-b', proceduralist: 'Dr B', episodes: { apnea: i < 12 ? 1 : 0 } })),
    ...Array.from({ length: 50 }, (_, i) => row({ proceduralistId: 'dr-c', proceduralist: 'Dr C', episodes: { apnea: i < 5 ? 1 : 0 } })),
    row({ proceduralistId: null, proceduralist: null }),
  ];
  const f = funnelBy(rows, 'proceduralist', apnea);

  it('uses the unit rate of the period as p0 and lib/stats funnelPlot for the limits', () => {
    expect(f.p0).toBeCloseTo(20 / 101, 12);
    const ref = funnelPlot(f.points.map((p) => ({ label: p.label, x: p.x, n: p.n })), 20 / 101);
    f.points.forEach((p, i) => expect(p.limits).toEqual(ref.units[i].limits));
    expect(f.points.map((p) => p.key)).toEqual(['dr-a', 'dr-b', 'dr-c', 'none']);
  });

  it('marks a person outside the 99.8 % limits as an outlier', () => {
    expect(f.points.find((p) => p.key === 'dr-b')?.flag).toBe('outlier');
    expect(f.points.find((p) => p.key === 'dr-c')?.flag).toBe(null);
  });

  it('draws nothing for a period without cases', () => {
    expect(funnelBy([], 'nurse', apnea)).toMatchObject({ points: [], curve: [], cases: 0 });
  });
});

describe('standardised ratios by room', () => {
  it('expect each room to have the unit reference rate of its ASA × procedure × regimen strata', () => {
    // Reference: ASA II colonoscopy propofol 10 % (5/50); ASA III ERCP propofol 40 % (8/20).
    const reference = [
      ...Array.from({ length: 50 }, (_, i) => row({ date: '2026-06-01', asaClass: 'II', procedureType: 'colonoscopy', episodes: { apnea: i < 5 ? 1 : 0 } })),
      ...Array.from({ length: 20 }, (_, i) => row({ date: '2026-06-01', asaClass: 'III', procedureType: 'ercp', episodes: { apnea: i < 8 ? 1 : 0 } })),
    ];
    // Room 3: 10 ASA II colonoscopies (expect 1) and 10 ASA III ERCPs (expect 4); 9 apneas observed.
    const target = [
      ...Array.from({ length: 10 }, (_, i) => row({ roomId: 'room-3', room: 'Room 3', asaClass: 'II', procedureType: 'colonoscopy', episodes: { apnea: i < 3 ? 1 : 0 } })),
      ...Array.from({ length: 10 }, (_, i) => row({ roomId: 'room-3', room: 'Room 3', asaClass: 'III', procedureType: 'ercp', episodes: { apnea: i < 6 ? 1 : 0 } })),
      row({ roomId: 'room-1', room: 'Room 1', asaClass: 'IV', procedureType: 'eus', episodes: { apnea: 1 } }),
    ];
    const oe = observedExpectedByRoom(target, reference, apnea);
    const r3 = oe.rooms.find((r) => r.key === 'room-3')!;
    expect(r3.observed).toBe(9);
    expect(r3.expected).toBeCloseTo(5, 12);
    expect(r3.ratio).toBeCloseTo(1.8, 12);
    const ref = indirectStandardisation(
      [{ stratum: stratumOf(reference[0]), x: 5, n: 50 }, { stratum: stratumOf(reference[60]), x: 8, n: 20 }],
      [{ stratum: stratumOf(target[0]), x: 3, n: 10 }, { stratum: stratumOf(target[10]), x: 6, n: 10 }],
    );
    expect(r3.lower).toBeCloseTo(ref.lower, 12);
    expect(r3.upper).toBeCloseTo(ref.upper, 12);
    const r1 = oe.rooms.find((r) => r.key === 'room-1')!;
    expect(r1).toMatchObject({ cases: 1, observed: 0, expected: 0, ratio: null, casesUnrated: 1 });
    expect(oe.total).toMatchObject({ cases: 21, observed: 9, casesUnrated: 1 });
    expect(oe.reference).toEqual({ cases: 70, events: 13 });
  });
});

describe('the review page model', () => {
  it('draws twelve months of trend from counts, the same p charts as from rows', async () => {
    const { buildReview, countsFromRows, monthPeriod, referencePeriod, trendMonths } = await import('@/lib/review');
    const period = monthPeriod('2026-11');
    const options = { period, reference: referencePeriod(period), ruleIds: RULES, responseLimitS: 60 };
    const months12 = trendMonths(period);
    expect(months12).toEqual(['2025-12', '2026-01', '2026-02', '2026-03', '2026-04', '2026-05', '2026-06', '2026-07', '2026-08', '2026-09', '2026-10', '2026-11']);
    const history = months(months12.map((m, i) => [m, i % 4, 20 + i] as [string, number, number]));
    const inPeriod = history.filter((r) => r.month === '2026-11');
    const review = buildReview(inPeriod, countsFromRows(history, history.filter((r) => r.month >= '2026-05' && r.month <= '2026-10'), options), options);
    const apneaSeries = review.trend.series.find((s) => s.figure === 'rule:apnea')!;
    expect(apneaSeries).toEqual(monthlySeries(history, apnea, months12));
    expect(review.headline.cases).toBe(31);
    expect(review.observedExpected.reference.cases).toBe(history.filter((r) => r.month >= '2026-05' && r.month <= '2026-10').length);
  });
});
