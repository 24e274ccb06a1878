import { describe, expect, it } from 'vitest';
import { casesBetweenEvents, gChart, pChart, uChart } from '@/lib/stats';
import { r4 } from './_helpers';

// Constructed to reproduce the summary values of the fraction-nonconforming example in
// Montgomery DC, Introduction to Statistical Quality Control (orange-juice cans, 30 samples
// of n = 50), from memory per ../shared/design/references.md: 347 nonconforming in total,
// exactly two samples (15 and 23) above the trial UCL, 301 of 1400 without them, and one
// sample (21) above the revised UCL that Montgomery keeps (no assignable cause).
const MONTGOMERY_COUNTS = [
  12, 15, 8, 10, 4, 7, 16, 9, 14, 10, 5, 6, 17, 12, 22, 8, 10, 5, 13, 11, 20, 18, 24, 15, 9, 12, 7, 13, 9, 6,
];
const samples = MONTGOMERY_COUNTS.map((x, i) => ({ label: `S${i + 1}`, x, n: 50 }));

describe('the monthly review shows a p chart of cases with an event', () => {
  it('the constructed samples have the published totals', () => {
    expect(MONTGOMERY_COUNTS).toHaveLength(30);
    expect(MONTGOMERY_COUNTS.reduce((s, x) => s + x, 0)).toBe(347);
    expect(347 - 22 - 24).toBe(301);
  });

  it('trial limits: p̄ = 0.2313, UCL = 0.4102, LCL = 0.0524 (Montgomery, from memory)', () => {
    // Montgomery, Introduction to Statistical Quality Control, p chart example (from memory; numbers computed).
    const chart = pChart(samples);
    expect(chart.kind).toBe('p');
    expect(r4(chart.centre)).toBe(0.2313);
    expect(r4(chart.points[0].ucl)).toBe(0.4102);
    expect(r4(chart.points[0].lcl)).toBe(0.0524);
    expect(chart.trialCentre).toBe(chart.centre);
    expect(chart.excludedLabels).toEqual([]);
    const outside = chart.points.filter((p) => p.value > p.ucl || p.value < p.lcl).map((p) => p.label);
    expect(outside).toEqual(['S15', 'S23']);
  });

  it('revised without the two out-of-control samples: p̄ = 0.2150, UCL = 0.3893, LCL = 0.0407', () => {
    // Montgomery, Introduction to Statistical Quality Control, revised p chart (from memory; numbers computed).
    const chart = pChart(samples, { revise: true });
    expect(chart.excludedLabels).toEqual(['S15', 'S23']);
    expect(chart.centre).toBeCloseTo(301 / 1400, 15);
    expect(r4(chart.centre)).toBe(0.215);
    expect(r4(chart.trialCentre)).toBe(0.2313);
    expect(r4(chart.points[0].ucl)).toBe(0.3893);
    expect(r4(chart.points[0].lcl)).toBe(0.0407);
    // One round only: sample 21 (0.40) is now above the UCL but stays in, as in Montgomery.
    const s21 = chart.points[20];
    expect(s21.value).toBeGreaterThan(s21.ucl);
    expect(s21.excluded).toBe(false);
    expect(chart.points[14].excluded).toBe(true);
  });

  it('a reviewer who found causes can exclude points by label', () => {
    const chart = pChart(samples, { exclude: ['S15', 'S23'] });
    expect(chart.centre).toBeCloseTo(0.215, 15);
    expect(chart.trialCentre).toBeCloseTo(0.215, 15);
    expect(chart.excludedLabels).toEqual(['S15', 'S23']);
  });

  it('months with different case numbers get their own limits, capped to [0, 1]', () => {
    const chart = pChart([
      { label: 'Jan', x: 4, n: 50 },
      { label: 'Feb', x: 6, n: 50 },
      { label: 'Mar', x: 1, n: 1 },
    ]);
    // p̄ = 11/101; Jan: p̄ + 3√(p̄(1 − p̄)/50); Mar (n = 1): p̄ + 3 SE = 1.04, so UCL = 1, LCL = 0.
    const pbar = 11 / 101;
    expect(chart.points[0].ucl).toBeCloseTo(pbar + 3 * Math.sqrt((pbar * (1 - pbar)) / 50), 15);
    expect(chart.points[0].lcl).toBe(0);
    expect(chart.points[2].ucl).toBe(1);
    expect(chart.points[2].value).toBe(1);
  });

  it('a month without cases is a caller error', () => {
    expect(() => pChart([{ label: 'Jan', x: 0, n: 0 }])).toThrow(/points\[0\]\.n must be a finite number > 0/);
  });
});

describe('the review shows a u chart of desaturation episodes per 100 cases', () => {
  it('hand computed: ū = 8/200, limits ū ± 3√(ū/e_i)', () => {
    // Hand computed: ū = 0.04 per case; e = 100 → 0.04 ± 3 × 0.02 → [0, 0.10]; e = 25 → [0, 0.16].
    const chart = uChart(
      [
        { label: 'Jan', count: 3, exposure: 75 },
        { label: 'Feb', count: 5, exposure: 100 },
        { label: 'Mar', count: 0, exposure: 25 },
      ],
      { per: 100 },
    );
    expect(chart.kind).toBe('u');
    expect(chart.centre).toBeCloseTo(4, 12);
    expect(chart.points[1].value).toBeCloseTo(5, 12);
    expect(chart.points[1].ucl).toBeCloseTo(10, 12);
    expect(chart.points[2].ucl).toBeCloseTo(16, 12);
    expect(chart.points[0].ucl).toBeCloseTo(4 + 300 * Math.sqrt(0.04 / 75), 12);
    expect(chart.points.every((p) => p.lcl === 0)).toBe(true);
  });

  it('revision works as on the p chart', () => {
    const points = [10, 11, 9, 10, 40, 10].map((count, i) => ({ label: `M${i + 1}`, count, exposure: 100 }));
    const chart = uChart(points, { revise: true });
    expect(chart.excludedLabels).toEqual(['M5']);
    expect(chart.centre).toBeCloseTo(50 / 500, 15);
    expect(chart.trialCentre).toBeCloseTo(90 / 600, 15);
  });
});

describe('rare serious events are tracked on a g chart of cases between events', () => {
  // Constructed example, hand computed: gaps 12, 40, 3, 85, 20 → ḡ = 32;
  // 3-sigma UCL = 32 + 3√(32 × 33) = 32 + 3 × 32.4962 = 129.4885; LCL floored at 0.
  // Geometric p = 1/33: probability limits (Benneyan 2001, Health Care Manag Sci 4:305-318)
  // lower = smallest k with 1 − (32/33)^(k+1) ≥ 0.00135 → 0;
  // upper = ⌈ln(0.00135)/ln(32/33) − 1⌉ = ⌈213.73⌉ = 214.
  const gaps = [12, 40, 3, 85, 20];

  it('centre and 3-sigma limits follow Benneyan: ḡ ± 3√(ḡ(ḡ + 1)), LCL floored at 0', () => {
    const chart = gChart(gaps);
    expect(chart.kind).toBe('g');
    expect(chart.centre).toBe(32);
    expect(chart.sigmaLimits.lcl).toBe(0);
    expect(r4(chart.sigmaLimits.ucl)).toBe(129.4885);
    expect(chart.points.map((p) => p.label)).toEqual(['1', '2', '3', '4', '5']);
    expect(chart.points[0].ucl).toBe(chart.sigmaLimits.ucl);
    expect(chart.limitsUsed).toBe('sigma');
  });

  it('probability limits are the geometric quantiles at 0.00135 and 0.99865', () => {
    const chart = gChart(gaps, { limits: 'probability', labels: ['a', 'b', 'c', 'd', 'e'] });
    expect(chart.probabilityLimits).toEqual({ lcl: 0, ucl: 214 });
    // The quantile definition: F(214) ≥ 0.99865 > F(213), F(k) = 1 − (32/33)^(k+1).
    const F = (k: number) => 1 - Math.pow(32 / 33, k + 1);
    expect(F(214)).toBeGreaterThanOrEqual(0.99865);
    expect(F(213)).toBeLessThan(0.99865);
    expect(chart.points[3]).toMatchObject({ label: 'd', value: 85, lcl: 0, ucl: 214 });
  });

  it('a long mean gap gives a positive lower probability limit', () => {
    // ḡ = 2000, p = 1/2001: lower = ⌈ln(1 − 0.00135)/ln(2000/2001) − 1⌉ = ⌈1.70⌉ = 2.
    expect(gChart([2000]).probabilityLimits.lcl).toBe(2);
  });

  it('bad input throws', () => {
    expect(() => gChart([3, -1])).toThrow(/gaps\[1\]/);
    expect(() => gChart([3, 4], { labels: ['x'] })).toThrow(/labels/);
  });
});

describe('the g values come from the case list with event flags', () => {
  it('counts event-free cases between events, sorting by date first', () => {
    const cases = [
      { at: '2024-03-05T10:00:00Z', event: false },
      { at: '2024-03-01T09:00:00Z', event: false },
      { at: '2024-03-02T09:00:00Z', event: true },
      { at: '2024-03-03T09:00:00Z', event: false },
      { at: '2024-03-03T11:00:00Z', event: false },
      { at: '2024-03-04T09:00:00Z', event: true },
      { at: '2024-03-04T10:00:00Z', event: true },
      { at: '2024-03-06T10:00:00Z', event: false },
    ];
    expect(casesBetweenEvents(cases)).toEqual({
      gaps: [1, 2, 0],
      labels: ['2024-03-02T09:00:00.000Z', '2024-03-04T09:00:00.000Z', '2024-03-04T10:00:00.000Z'],
      sinceLastEvent: 2,
    });
    expect(casesBetweenEvents(cases, { countFromStart: false }).gaps).toEqual([2, 0]);
  });

  it('accepts Date objects, keeps input order for equal times, and feeds gChart', () => {
    const t = new Date('2024-01-01T00:00:00Z');
    const r = casesBetweenEvents([
      { at: t, event: false },
      { at: t, event: true },
      { at: t, event: false },
    ]);
    expect(r.gaps).toEqual([1]);
    expect(r.sinceLastEvent).toBe(1);
    expect(gChart(r.gaps, { labels: r.labels }).points[0].label).toBe('2024-01-01T00:00:00.000Z');
  });

  it('no events: no g values, everything is the open gap; a bad date throws', () => {
    expect(casesBetweenEvents([{ at: '2024-01-01', event: false }])).toEqual({ gaps: [], labels: [], sinceLastEvent: 1 });
    expect(() => casesBetweenEvents([{ at: 'yesterday', event: true }])).toThrow(/cases\[0\]\.at/);
  });
});
