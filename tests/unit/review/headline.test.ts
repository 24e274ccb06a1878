import { describe, expect, it } from 'vitest';
import { wilsonInterval, poissonRateInterval, quantile } from '@/lib/stats';
import { proportion, reviewHeadline } from '@/lib/review';
import { row, RULES } from './_rows';

const OPTS = { ruleIds: RULES, responseLimitS: 60 };

describe('the headline of a month', () => {
  // 10 reviewed cases: 3 with apnea (one of them also prolonged), 2 with hypoxemia, one supported,
  // one rescued, plus 2 signed cases without a summary that must count nowhere.
  const rows = [
    row({ episodes: { apnea: 1 }, summary: { caseLevel: 'corrected', firstApneaResponseS: 10 } }),
    row({ episodes: { apnea: 2, prolonged_apnea: 1 }, summary: { caseLevel: 'supported', majorPhysiology: true, firstApneaResponseS: 75 } }),
    row({ episodes: { apnea: 1, hypoxemia: 1 }, summary: { caseLevel: 'observed', firstApneaResponseS: null } }),
    row({ episodes: { hypoxemia: 1 }, summary: { caseLevel: 'rescued' } }),
    row(),
    row(),
    row(),
    row(),
    row(),
    row(),
    row({ summary: null }),
    row({ summary: null, episodes: { apnea: 4 } }),
  ];
  const h = reviewHeadline(rows, OPTS);
  const fig = (id: string) => h.figures.find((f) => f.id === id)!;

  it('counts sedated cases as the signed cases with a summary, and says how many had none', () => {
    expect(h.cases).toBe(10);
    expect(h.withoutSummary).toBe(2);
    for (const f of h.figures) expect(f.denominator).toBe(10);
  });

  it('counts cases (not episodes) with each rule, each level, support or rescue, and major physiology', () => {
    expect(fig('rule:apnea').numerator).toBe(3);
    expect(fig('rule:prolonged_apnea').numerator).toBe(1);
    expect(fig('rule:hypoxemia').numerator).toBe(2);
    expect(fig('any_episode').numerator).toBe(4);
    expect(fig('level:none').numerator).toBe(6);
    expect(fig('level:corrected').numerator).toBe(1);
    expect(fig('level:supported').numerator).toBe(1);
    expect(fig('level:rescued').numerator).toBe(1);
    expect(fig('supported_or_above').numerator).toBe(2);
    expect(fig('major_physiology').numerator).toBe(1);
    expect(fig('apnea_response_over_limit').numerator).toBe(1);
    expect(fig('in_review_queue').numerator).toBe(2);
  });

  it('puts every case at exactly one level', () => {
    const levels = h.figures.filter((f) => f.group === 'level');
    expect(levels.reduce((a, f) => a + f.numerator, 0)).toBe(h.cases);
  });

  it('gives each figure its rate and the Wilson 95 % interval of lib/stats', () => {
    for (const f of h.figures) {
      const w = wilsonInterval(f.numerator, f.denominator);
      expect(f.rate).toBeCloseTo(w.estimate, 12);
      expect(f.lower).toBeCloseTo(w.lower, 12);
      expect(f.upper).toBeCloseTo(w.upper, 12);
    }
    // 3/10 with Wilson: 0.1078–0.6032 (the Wilson 1927 score formula; 0.108–0.603 is the usual tabulated value, from memory)
    expect(fig('rule:apnea').lower).toBeCloseTo(0.1078, 4);
    expect(fig('rule:apnea').upper).toBeCloseTo(0.6032, 4);
  });

  it('counts episodes per 1,000 cases with the exact Poisson interval', () => {
    const apnea = h.episodeRates.find((e) => e.ruleId === 'apnea')!;
    expect(apnea.episodes).toBe(4);
    const p = poissonRateInterval(4, 10, { per: 1000 });
    expect(apnea.per1000).toBeCloseTo(400, 9);
    expect(apnea.lower).toBeCloseTo(p.lower, 9);
    expect(apnea.upper).toBeCloseTo(p.upper, 9);
  });

  it('takes the response time to apnea from the cases whose first apnea was answered', () => {
    expect(h.apneaResponse.casesWithApnea).toBe(3);
    expect(h.apneaResponse.responded).toEqual(proportion(2, 3));
    expect(h.apneaResponse.values).toEqual([10, 75]);
    expect(h.apneaResponse.median.value).toBe(quantile([10, 75], 0.5));
    expect(h.apneaResponse.p90.value).toBeCloseTo(68.5, 9);
  });

  it('says nothing rather than NaN for an empty month', () => {
    const empty = reviewHeadline([], OPTS);
    expect(empty.cases).toBe(0);
    expect(empty.figures.every((f) => f.rate === null && f.lower === 0 && f.upper === 1)).toBe(true);
    expect(empty.apneaResponse.median).toEqual({ value: null, lower: null, upper: null });
    expect(empty.episodeRates[0].per1000).toBeNull();
    expect(JSON.parse(JSON.stringify(empty))).toEqual(empty);
  });
});
