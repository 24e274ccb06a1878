import { describe, expect, it } from 'vitest';
import jStat from 'jstat';
import { indirectStandardisation } from '@/lib/stats';
import { r4 } from './_helpers';

// Small hand-computed example (constructed). Reference: all units, by ASA class.
const reference = [
  { stratum: 'ASA I-II', x: 10, n: 1000 },
  { stratum: 'ASA III', x: 15, n: 500 },
  { stratum: 'ASA IV', x: 5, n: 50 },
];

describe('a unit with sicker patients is compared with the whole service by indirect standardisation', () => {
  it('observed 9 against expected 100 × 0.01 + 100 × 0.03 + 20 × 0.1 = 6: ratio 1.5', () => {
    const target = [
      { stratum: 'ASA I-II', x: 1, n: 100 },
      { stratum: 'ASA III', x: 5, n: 100 },
      { stratum: 'ASA IV', x: 3, n: 20 },
    ];
    const r = indirectStandardisation(reference, target);
    expect(r.observed).toBe(9);
    expect(r.expected).toBeCloseTo(6, 13);
    expect(r.ratio).toBeCloseTo(1.5, 13);
    expect(r.strataUsed.map((s) => [s.stratum, s.expected])).toEqual([
      ['ASA I-II', 1],
      ['ASA III', 3],
      ['ASA IV', 2],
    ]);
    expect(r.strataMissing).toEqual([]);
    // Exact Poisson (Garwood) limits on O = 9: χ²(0.025; 18)/2 = 4.1153, χ²(0.975; 20)/2 = 17.0848
    // (re-derived with jstat), divided by E = 6.
    expect(r.lower).toBeCloseTo(jStat.chisquare.inv(0.025, 18) / 2 / 6, 9);
    expect(r.upper).toBeCloseTo(jStat.chisquare.inv(0.975, 20) / 2 / 6, 9);
    expect([r4(r.lower), r4(r.upper)]).toEqual([0.6859, 2.8475]);
  });

  it('strata the reference cannot rate are reported and left out of O and E', () => {
    const target = [
      { stratum: 'ASA III', x: 2, n: 40 },
      { stratum: 'ASA V', x: 1, n: 2 },
      { stratum: 'ASA III', x: 1, n: 10 },
      { stratum: 'unknown', x: 0, n: 5 },
    ];
    const r = indirectStandardisation([...reference, { stratum: 'unknown', x: 0, n: 0 }], target);
    expect(r.strataUsed).toEqual([{ stratum: 'ASA III', observed: 3, n: 50, referenceRate: 0.03, expected: 1.5 }]);
    expect(r.strataMissing).toEqual([
      { stratum: 'ASA V', x: 1, n: 2 },
      { stratum: 'unknown', x: 0, n: 5 },
    ]);
    expect(r.observed).toBe(3);
    expect(r.ratio).toBeCloseTo(2, 13);
  });

  it('no observed events gives lower 0; a 90 % interval is narrower', () => {
    const r = indirectStandardisation(reference, [{ stratum: 'ASA IV', x: 0, n: 30 }]);
    expect(r.ratio).toBe(0);
    expect(r.lower).toBe(0);
    expect(r.upper).toBeCloseTo(-Math.log(0.025) / 3, 12);
    const r90 = indirectStandardisation(reference, [{ stratum: 'ASA IV', x: 0, n: 30 }], { confidence: 0.9 });
    expect(r90.upper).toBeCloseTo(-Math.log(0.05) / 3, 12);
  });

  it('expected 0 gives NaN or Infinity; bad counts throw', () => {
    const zero = [{ stratum: 'A', x: 0, n: 100 }];
    expect(indirectStandardisation(zero, [{ stratum: 'A', x: 0, n: 10 }]).ratio).toBeNaN();
    expect(indirectStandardisation(zero, [{ stratum: 'A', x: 1, n: 10 }]).ratio).toBe(Infinity);
    expect(() => indirectStandardisation(zero, [{ stratum: 'A', x: 11, n: 10 }])).toThrow(/target\[0\]\.x/);
  });
});
