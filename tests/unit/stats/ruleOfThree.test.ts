import { describe, expect, it } from 'vitest';
import { clopperPearsonInterval, ruleOfThree, zeroEventUpperBound } from '@/lib/stats';
import { r4 } from './_helpers';

// Source: Hanley JA, Lippman-Hand A 1983, "If nothing goes wrong, is everything all right?
// Interpreting zero numerators", JAMA 249:1743-5 (values per ../shared/design/references.md).
describe('a new unit has had no laryngospasm in its first cases', () => {
  it('after 20 cases the rule of three says up to 15 %', () => {
    expect(ruleOfThree(20)).toBe(0.15);
  });

  it('after 20 cases the exact one-sided 95 % bound is 1 − 0.05^(1/20) = 0.1391', () => {
    // Hanley & Lippman-Hand 1983 (n = 20: 0.1391, references.md).
    expect(r4(zeroEventUpperBound(20))).toBe(0.1391);
    expect(zeroEventUpperBound(20)).toBeCloseTo(1 - Math.pow(0.05, 1 / 20), 15);
  });

  it('3/n and the exact bound converge as n grows', () => {
    for (const n of [100, 1000, 10000]) {
      expect(Math.abs(ruleOfThree(n) - zeroEventUpperBound(n)) * n).toBeLessThan(0.05);
    }
  });

  it('the exact one-sided 95 % bound equals the two-sided 90 % Clopper-Pearson upper limit', () => {
    for (const n of [1, 7, 20, 150]) {
      expect(zeroEventUpperBound(n)).toBeCloseTo(clopperPearsonInterval(0, n, { confidence: 0.9 }).upper, 12);
    }
  });

  it('other confidence levels and bad n', () => {
    expect(zeroEventUpperBound(10, { confidence: 0.99 })).toBeCloseTo(1 - Math.pow(0.01, 0.1), 15);
    expect(() => ruleOfThree(0)).toThrow(/n must be a finite number > 0/);
    expect(() => zeroEventUpperBound(-3)).toThrow(RangeError);
  });
});
