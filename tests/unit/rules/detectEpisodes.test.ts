import { describe, expect, it } from 'vitest';
import { analyzeCase, PLATEAU_DEFAULT_V1, type RuleSet } from '@/lib/rules';
import { caseOf, monitor, monitorAt, oneRule, runs } from './_build';

const bounds = (rs: RuleSet, ...series: Parameters<typeof caseOf>[0]) =>
  analyzeCase(caseOf(series), rs).episodes.map((e) => [e.rule, e.start, e.end, e.censoredAt]);

const lowSpo2 = (minDurationS: number, mergeGapS?: number) =>
  oneRule({ id: 'low', terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }], combine: 'any', minDurationS, mergeGapS });

describe('episodes (rules.md §2)', () => {
  it('starts an episode at the first true instant and ends it at the first instant no longer true', () => {
    expect(bounds(lowSpo2(0), monitor('spo2', runs([97, 100], [88, 20], [97, 100])))).toEqual([['low', 100, 120, null]]);
  });

  it('counts an episode of exactly the minimum duration and not one a sample short', () => {
    expect(bounds(lowSpo2(15), monitor('spo2', runs([97, 100], [88, 15], [97, 100])))).toEqual([['low', 100, 115, null]]);
    expect(bounds(lowSpo2(15), monitor('spo2', runs([97, 100], [88, 14], [97, 100])))).toEqual([]);
  });

  it('splits an apnea when breathing resumes for 5 s', () => {
    const et = runs([38, 100], [0, 25], [35, 5], [0, 25], [38, 100]);
    const rr = runs([14, 100], [0, 25], [12, 5], [0, 25], [14, 100]);
    const eps = bounds(PLATEAU_DEFAULT_V1, monitor('etco2', et), monitor('rr', rr), monitor('spo2', runs([98, 255])));
    expect(eps).toEqual([
      ['apnea', 100, 125, null],
      ['apnea', 130, 155, null],
    ]);
  });

  it('joins the two halves of that apnea when the rule merges gaps under 10 s', () => {
    const et = runs([38, 100], [0, 25], [35, 5], [0, 25], [38, 100]);
    const rs = oneRule({ id: 'apnea', terms: [{ channel: 'etco2', comparator: '<', threshold: 5 }], combine: 'any', minDurationS: 20, mergeGapS: 10 });
    expect(bounds(rs, monitor('etco2', et))).toEqual([['apnea', 100, 155, null]]);
    const rsShort = { ...rs, rules: [{ ...rs.rules[0], mergeGapS: 5 }] };
    expect(bounds(rsShort, monitor('etco2', et))).toHaveLength(2);
  });

  it('merges only episodes: two 15 s pieces with a 20 s minimum stay below it whatever the merge gap', () => {
    const et = runs([38, 100], [0, 15], [35, 3], [0, 15], [38, 100]);
    const rs = oneRule({ id: 'apnea', terms: [{ channel: 'etco2', comparator: '<', threshold: 5 }], combine: 'any', minDurationS: 20, mergeGapS: 10 });
    expect(bounds(rs, monitor('etco2', et))).toEqual([]);
  });

  it('censors an episode that ends at a data gap longer than maxHold', () => {
    const t = [...Array.from({ length: 130 }, (_, i) => i), ...Array.from({ length: 50 }, (_, i) => 300 + i)];
    const v = [...runs([97, 100], [85, 30]), ...runs([97, 50])];
    expect(bounds(lowSpo2(0), monitorAt('spo2', t, v))).toEqual([['low', 100, 159, 'end']]);
  });

  it('censors an episode that runs to the end of the series', () => {
    expect(bounds(lowSpo2(0), monitor('spo2', runs([97, 100], [85, 30])))).toEqual([['low', 100, 130, 'end']]);
  });

  it('censors an episode that starts at the first observed instant, and one right after a gap', () => {
    expect(bounds(lowSpo2(0), monitor('spo2', runs([85, 30], [97, 30])))).toEqual([['low', 0, 30, 'start']]);
    const t = [...Array.from({ length: 50 }, (_, i) => i), ...Array.from({ length: 50 }, (_, i) => 200 + i)];
    const v = [...runs([97, 50]), ...runs([85, 20], [97, 30])];
    expect(bounds(lowSpo2(0), monitorAt('spo2', t, v))).toEqual([['low', 200, 220, 'start']]);
    expect(bounds(lowSpo2(0), monitor('spo2', runs([85, 30])))).toEqual([['low', 0, 30, 'both']]);
  });

  it('does not censor an episode that ends because the value recovered, though another channel of the rule has no data there', () => {
    // apnea = EtCO2 < 5 OR RR = 0; RR stops early, EtCO2 recovers at 125
    const et = runs([38, 100], [0, 25], [38, 100]);
    const eps = bounds(PLATEAU_DEFAULT_V1, monitor('etco2', et), monitor('rr', runs([14, 50])), monitor('spo2', runs([98, 225])));
    expect(eps).toEqual([['apnea', 100, 125, null]]);
  });

  it('censors an AND episode when its end is unobserved on one channel and observed true on the other', () => {
    const rs = oneRule({
      id: 'slow_and_low',
      terms: [
        { channel: 'rr', comparator: '<', threshold: 8 },
        { channel: 'spo2', comparator: '<', threshold: 90 },
      ],
      combine: 'all',
      minDurationS: 0,
    });
    // both true from 100; SpO2 stops at 130 (still low), RR goes on low
    expect(bounds(rs, monitor('rr', runs([14, 100], [6, 100])), monitor('spo2', runs([97, 100], [85, 30])))).toEqual([['slow_and_low', 100, 130, 'end']]);
    // SpO2 recovers at 130 while observed: ends, not censored
    expect(bounds(rs, monitor('rr', runs([14, 100], [6, 100])), monitor('spo2', runs([97, 100], [85, 30], [97, 70])))).toEqual([['slow_and_low', 100, 130, null]]);
  });

  it('treats severe hypoxemia with a 0 s minimum as any covered time below 85 %', () => {
    const eps = bounds(PLATEAU_DEFAULT_V1, monitor('spo2', runs([97, 100], [84, 1], [97, 100])));
    expect(eps).toEqual([['severe_hypoxemia', 100, 101, null]]);
  });
});
