import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import jStat from 'jstat';
import { clopperPearsonInterval, wilsonCcInterval, wilsonInterval } from '@/lib/stats';
import { r4 } from './_helpers';

// Source for every row: Newcombe RG 1998, "Two-sided confidence intervals for the single
// proportion: comparison of seven methods", Stat Med 17:857-872, Table II (95 %);
// methods 3 (Wilson score), 4 (score with continuity correction), 5 (Clopper-Pearson).
// Values as in ../shared/design/references.md ("computed and matching the paper's table as remembered").
const NEWCOMBE_1998_TABLE_II = [
  { x: 81, n: 263, wilson: [0.2553, 0.3662], exact: [0.2527, 0.3676], wilsonCc: [0.2535, 0.3682] },
  { x: 15, n: 148, wilson: [0.0624, 0.1605], exact: [0.0578, 0.1617], wilsonCc: [0.0598, 0.1644] },
  { x: 0, n: 20, wilson: [0, 0.1611], exact: [0, 0.1684], wilsonCc: [0, 0.2005] },
  { x: 1, n: 29, wilson: [0.0061, 0.1718], exact: [0.0009, 0.1776], wilsonCc: [0.0018, 0.1963] },
];

describe('a reviewer puts a 95 % interval on the proportion of cases with an event', () => {
  for (const row of NEWCOMBE_1998_TABLE_II) {
    it(`gets Newcombe's Wilson score limits for ${row.x}/${row.n}`, () => {
      // Newcombe 1998, Stat Med 17:857-872, Table II, method 3.
      const ci = wilsonInterval(row.x, row.n);
      expect([r4(ci.lower), r4(ci.upper)]).toEqual(row.wilson);
      expect(ci.estimate).toBe(row.x / row.n);
    });
    it(`gets Newcombe's continuity-corrected score limits for ${row.x}/${row.n}`, () => {
      // Newcombe 1998, Stat Med 17:857-872, Table II, method 4.
      const ci = wilsonCcInterval(row.x, row.n);
      expect([r4(ci.lower), r4(ci.upper)]).toEqual(row.wilsonCc);
    });
    it(`gets Newcombe's Clopper-Pearson limits for ${row.x}/${row.n}`, () => {
      // Newcombe 1998, Stat Med 17:857-872, Table II, method 5.
      const ci = clopperPearsonInterval(row.x, row.n);
      expect([r4(ci.lower), r4(ci.upper)]).toEqual(row.exact);
    });
  }
});

describe('a unit with no events, or only events, gets bounds of exactly 0 and 1', () => {
  const methods = { wilsonInterval, wilsonCcInterval, clopperPearsonInterval };
  for (const [name, f] of Object.entries(methods)) {
    it(`${name}: 0/n has lower 0 and n/n has upper 1, exactly`, () => {
      for (const n of [1, 2, 7, 20, 1000]) {
        expect(f(0, n).lower).toBe(0);
        expect(f(n, n).upper).toBe(1);
        expect(f(0, n).upper).toBeLessThan(1);
        expect(f(n, n).lower).toBeGreaterThan(0);
      }
    });
    it(`${name}: 0/n and n/n mirror each other`, () => {
      for (const n of [1, 5, 29, 300]) {
        expect(f(n, n).lower).toBeCloseTo(1 - f(0, n).upper, 12);
      }
    });
    it(`${name}: an empty month (n = 0) gives NaN and the uninformative 0–1`, () => {
      expect(f(0, 0)).toEqual({ estimate: Number.NaN, lower: 0, upper: 1 });
    });
    it(`${name}: bad counts throw a RangeError that names the argument`, () => {
      expect(() => f(5, 3)).toThrow(/x must not exceed n/);
      expect(() => f(-1, 3)).toThrow(/x must be a whole number/);
      expect(() => f(1.5, 3)).toThrow(RangeError);
      expect(() => f(1, Number.NaN)).toThrow(/n must be a whole number/);
      expect(() => f(1, 3, { confidence: 1 })).toThrow(/confidence/);
    });
  }

  it('a higher confidence gives a wider interval', () => {
    const a = wilsonInterval(15, 148, { confidence: 0.9 });
    const b = wilsonInterval(15, 148, { confidence: 0.99 });
    expect(b.lower).toBeLessThan(a.lower);
    expect(b.upper).toBeGreaterThan(a.upper);
  });
});

describe('Clopper-Pearson agrees with jstat over many random x/n', () => {
  // Second reference: jstat 1.9 jStat.beta.inv. jstat's continued fraction stops at a
  // relative change of 3e-7, so it is itself good to about 1e-9; we allow 2e-9.
  const xn = fc.integer({ min: 1, max: 5000 }).chain((n) => fc.tuple(fc.integer({ min: 0, max: n }), fc.constant(n)));

  it('lower and upper limits match jStat.beta.inv within 2e-9', () => {
    fc.assert(
      fc.property(xn, ([x, n]) => {
        const ci = clopperPearsonInterval(x, n);
        const lower = x === 0 ? 0 : jStat.beta.inv(0.025, x, n - x + 1);
        const upper = x === n ? 1 : jStat.beta.inv(0.975, x + 1, n - x);
        expect(Math.abs(ci.lower - lower)).toBeLessThan(2e-9);
        expect(Math.abs(ci.upper - upper)).toBeLessThan(2e-9);
      }),
      { numRuns: 400 },
    );
  });

  // jstat.ibeta's own error reaches ~5e-9 near n = 5000, hence 7 digits here.
  it('at the limits the binomial tails are exactly α/2 (checked with jstat.ibeta)', () => {
    fc.assert(
      fc.property(xn, ([x, n]) => {
        const ci = clopperPearsonInterval(x, n, { confidence: 0.9 });
        // P(X ≥ x | p = lower) = I_lower(x, n − x + 1) = 0.05; P(X ≤ x | p = upper) = 1 − I_upper(x + 1, n − x) = 0.05
        if (x > 0) expect(jStat.ibeta(ci.lower, x, n - x + 1)).toBeCloseTo(0.05, 7);
        if (x < n) expect(1 - jStat.ibeta(ci.upper, x + 1, n - x)).toBeCloseTo(0.05, 7);
      }),
      { numRuns: 200 },
    );
  });

  it('Wilson always lies inside [0, 1] and contains the estimate', () => {
    fc.assert(
      fc.property(xn, ([x, n]) => {
        for (const ci of [wilsonInterval(x, n), wilsonCcInterval(x, n), clopperPearsonInterval(x, n)]) {
          expect(ci.lower).toBeGreaterThanOrEqual(0);
          expect(ci.upper).toBeLessThanOrEqual(1);
          expect(ci.lower).toBeLessThanOrEqual(ci.estimate);
          expect(ci.upper).toBeGreaterThanOrEqual(ci.estimate);
        }
      }),
      { numRuns: 300 },
    );
  });
});
