import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import jStat from 'jstat';
import { funnelLimits, funnelPlot, overdispersionFactor } from '@/lib/stats';
import { r4 } from './_helpers';

/**
 * Reference limit computed from jstat (jStat.ibeta as the binomial CDF, a general-purpose
 * library as second reference per references.md) with Spiegelhalter's interpolation
 * (Spiegelhalter DJ 2005, "Funnel plots for comparing institutional performance",
 * Stat Med 24:1185-1202, appendix, from memory): r = smallest count with F(r) ≥ q,
 * α = (F(r) − q)/(F(r) − F(r − 1)), limit = (r − α)/n.
 */
function jstatCdf(r: number, n: number, p: number): number {
  if (r < 0) return 0;
  if (r >= n) return 1;
  return jStat.ibeta(1 - p, n - r, r + 1);
}
function jstatQuantile(q: number, n: number, p: number): number {
  let r = 0;
  while (jstatCdf(r, n, p) < q) r++;
  return r;
}
function jstatLimit(q: number, n: number, p: number): number {
  const r = jstatQuantile(q, n, p);
  const fr = jstatCdf(r, n, p);
  const alpha = (fr - q) / (fr - jstatCdf(r - 1, n, p));
  return Math.min(1, Math.max(0, (r - alpha) / n));
}

describe('units are compared on a funnel plot around a target proportion', () => {
  it('exact binomial limits for p0 = 0.1, n = 100 (computed, checked against jstat below)', () => {
    const [l95, l998] = funnelLimits(0.1, 100);
    expect([l95.level, r4(l95.lower), r4(l95.upper)]).toEqual([0.95, 0.0404, 0.1577]);
    expect([l998.level, r4(l998.lower), r4(l998.upper)]).toEqual([0.998, 0.0142, 0.1984]);
  });

  it('the binomial quantiles and interpolated limits match jstat over many random p0 and n (2e-9)', () => {
    // jstat's incomplete beta is itself good to about 1e-9 here, hence 2e-9.
    fc.assert(
      fc.property(
        fc.double({ min: 0.001, max: 0.6, noNaN: true }),
        fc.integer({ min: 1, max: 3000 }),
        (p0, n) => {
          const [l95, l998] = funnelLimits(p0, n);
          const ours = [l95.lower, l95.upper, l998.lower, l998.upper];
          [0.025, 0.975, 0.001, 0.999].forEach((q, i) => {
            expect(Math.abs(ours[i] - jstatLimit(q, n, p0))).toBeLessThan(2e-9);
          });
        },
      ),
      { numRuns: 300 },
    );
  });

  it('an exact limit sits between (r − 1)/n and r/n, r the binomial quantile', () => {
    fc.assert(
      fc.property(fc.double({ min: 0.01, max: 0.5, noNaN: true }), fc.integer({ min: 5, max: 2000 }), (p0, n) => {
        const upper = funnelLimits(p0, n, { levels: [0.998] })[0].upper;
        const r = jstatQuantile(0.999, n, p0);
        expect(upper).toBeGreaterThanOrEqual((r - 1) / n - 1e-12);
        expect(upper).toBeLessThanOrEqual(r / n + 1e-12);
      }),
      { numRuns: 100 },
    );
  });

  it('the normal approximation is p0 ± z√(p0(1 − p0)/n), z = 1.96 and 3.09', () => {
    // Spiegelhalter 2005 (references.md): z = 1.959964 (95 %), 3.090232 (99.8 %).
    const [l95, l998] = funnelLimits(0.2, 400, { method: 'normal' });
    const se = Math.sqrt((0.2 * 0.8) / 400);
    expect(l95.upper).toBeCloseTo(0.2 + 1.959963984540054 * se, 14);
    expect(l998.lower).toBeCloseTo(0.2 - 3.090232306167813 * se, 14);
    expect(r4(l998.upper)).toBe(0.2618);
  });

  it('at large n the exact and normal limits agree', () => {
    const exact = funnelLimits(0.15, 20000);
    const normal = funnelLimits(0.15, 20000, { method: 'normal' });
    exact.forEach((l, i) => {
      expect(l.lower).toBeCloseTo(normal[i].lower, 3);
      expect(l.upper).toBeCloseTo(normal[i].upper, 3);
    });
  });

  it('overdispersion φ widens the distance from p0 by √φ (Spiegelhalter 2005, from memory)', () => {
    const plain = funnelLimits(0.2, 400, { method: 'normal' });
    const wide = funnelLimits(0.2, 400, { method: 'normal', phi: 4 });
    expect(wide[0].upper - 0.2).toBeCloseTo(2 * (plain[0].upper - 0.2), 14);
    const exact = funnelLimits(0.2, 400);
    const exactWide = funnelLimits(0.2, 400, { phi: 2.25 });
    expect(0.2 - exactWide[1].lower).toBeCloseTo(1.5 * (0.2 - exact[1].lower), 14);
  });

  it('limits stay inside [0, 1], and p0 = 0 collapses the funnel', () => {
    const [l] = funnelLimits(0.01, 5, { levels: [0.998], phi: 9 });
    expect(l.lower).toBe(0);
    expect(l.upper).toBeLessThanOrEqual(1);
    expect(funnelLimits(0, 50)).toEqual([
      { level: 0.95, lower: 0, upper: 0 },
      { level: 0.998, lower: 0, upper: 0 },
    ]);
  });

  it('bad input throws', () => {
    expect(() => funnelLimits(1.2, 10)).toThrow(/p0/);
    expect(() => funnelLimits(0.2, 0)).toThrow(/n must be a finite number > 0/);
    expect(() => funnelLimits(0.2, 10, { levels: [95] })).toThrow(/level/);
    expect(() => funnelLimits(0.2, 10, { phi: 0 })).toThrow(/phi/);
  });
});

describe('funnelPlot places each unit against its own limits', () => {
  const units = [
    { label: 'A', x: 30, n: 100 },
    { label: 'B', x: 70, n: 900 },
    { label: 'C', x: 0, n: 60 },
  ];

  it('the target defaults to the pooled proportion; outside is judged strictly', () => {
    const plot = funnelPlot(units);
    expect(plot.p0).toBe(100 / 1060);
    expect(plot.levels).toEqual([0.95, 0.998]);
    const a = plot.units[0];
    expect(a.proportion).toBe(0.3);
    expect(a.limits.map((l) => l.outside)).toEqual(['above', 'above']);
    expect(a.limits[0]).toMatchObject(funnelLimits(plot.p0, 100)[0]);
    const c = plot.units[2];
    expect(c.limits[0].outside).toBe('below');
    expect(c.limits[1].outside).toBe(null);
  });

  it('a given target is used as is, and curve points span the units’ n on a log scale', () => {
    const plot = funnelPlot(units, 0.1, { curvePoints: 20 });
    expect(plot.p0).toBe(0.1);
    expect(plot.curve[0].n).toBe(60);
    expect(plot.curve.at(-1)?.n).toBe(900);
    const ns = plot.curve.map((c) => c.n);
    expect(ns).toEqual([...ns].sort((x, y) => x - y));
    expect(new Set(ns).size).toBe(ns.length);
    expect(ns.length).toBeLessThanOrEqual(20);
    expect(plot.curve[3].limits).toEqual(funnelLimits(0.1, plot.curve[3].n));
  });

  it('a curve range and φ can be given; φ is applied to unit and curve limits alike', () => {
    const plot = funnelPlot(units, 0.1, { curveRange: [1, 2000], phi: 2, method: 'normal' });
    expect(plot.curve[0].n).toBe(1);
    expect(plot.curve.at(-1)?.n).toBe(2000);
    expect(plot.phi).toBe(2);
    expect(plot.units[1].limits[1].upper).toBeCloseTo(0.1 + Math.SQRT2 * 3.090232306167813 * Math.sqrt(0.09 / 900), 14);
  });

  it('no units gives an empty plot; a unit without cases throws', () => {
    expect(funnelPlot([], 0.1)).toMatchObject({ units: [], curve: [] });
    expect(() => funnelPlot([{ label: 'X', x: 0, n: 0 }], 0.1)).toThrow(/units\[0\]\.n/);
  });
});

describe('overdispersion is estimated from the units’ z-scores', () => {
  it('hand computed: z = −5/3, 5/3, 0 → φ = 50/27 without winsorizing', () => {
    // z_i = (p_i − 0.1)/√(0.09/100) = (−0.05, 0.05, 0)/0.03.
    const units = [
      { x: 5, n: 100 },
      { x: 15, n: 100 },
      { x: 10, n: 100 },
    ];
    expect(overdispersionFactor(units, 0.1, { winsorize: 0 })).toBeCloseTo(50 / 27, 14);
  });

  it('winsorizing at 10 %/90 % pulls in the most extreme unit', () => {
    // 10 units, one extreme: z = 0 × 9 and (40 − 10)/3 = 10. Type 7 90th percentile of z is
    // 0 + 0.1 × 10 = 1, so the extreme z becomes 1 and φ = 1/10.
    const units = [...Array(9).fill({ x: 10, n: 100 }), { x: 40, n: 100 }];
    expect(overdispersionFactor(units, 0.1, { winsorize: 0 })).toBeCloseTo(10, 12);
    expect(overdispersionFactor(units, 0.1)).toBeCloseTo(0.1, 12);
  });
});
