import { describe, expect, it } from 'vitest';
import { getBuiltInRuleSet, listBuiltInRuleSets, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { ruleSetSchema, type RuleTerm } from '@/lib/domain/ruleSet';

const show = (t: RuleTerm) => `${t.channel} ${t.comparator} ${t.relativeTo ? `baseline${t.threshold >= 0 ? '+' : ''}${t.threshold}` : t.threshold}`;

describe('built-in rule sets', () => {
  it('writes plateau-default v1 exactly as the table of rules.md §4', () => {
    const table = PLATEAU_DEFAULT_V1.rules.map((r) => [r.id, r.terms.map(show).join(r.combine === 'any' ? ' OR ' : ' AND '), r.minDurationS]);
    expect(table).toEqual([
      ['apnea', 'etco2 < 5 OR rr = 0', 20],
      ['prolonged_apnea', 'etco2 < 5 OR rr = 0', 60],
      ['hypoventilation', 'etco2 >= 50 OR etco2 >= baseline+10', 30],
      ['low_etco2', 'etco2 <= baseline-10 AND etco2 >= 5', 30],
      ['bradypnea', 'rr < 8 AND rr > 0', 30],
      ['hypoxemia', 'spo2 < 90', 15],
      ['severe_hypoxemia', 'spo2 < 85', 0],
      ['prolonged_hypoxemia', 'spo2 < 90', 60],
      ['critical_hypoxemia', 'spo2 < 75', 0],
    ]);
    expect(PLATEAU_DEFAULT_V1.rules.filter((r) => r.major).map((r) => r.id)).toEqual(['prolonged_apnea', 'prolonged_hypoxemia', 'critical_hypoxemia']);
    expect(PLATEAU_DEFAULT_V1.rules.every((r) => (r.mergeGapS ?? 0) === 0)).toBe(true);
  });

  it('validates every built-in against the rule-set schema, with a description and a source on each rule', () => {
    const sets = listBuiltInRuleSets();
    expect(sets.length).toBeGreaterThanOrEqual(4);
    for (const set of sets) {
      expect(ruleSetSchema.safeParse(set).success).toBe(true);
      for (const r of set.rules) {
        expect(r.description.length).toBeGreaterThan(0);
        expect(r.source.length).toBeGreaterThan(0);
      }
    }
  });

  it('says "from memory" wherever the reference list does', () => {
    const sources = (id: string) => getBuiltInRuleSet(id)!.rules.map((r) => r.source).join(' ');
    expect(PLATEAU_DEFAULT_V1.rules.find((r) => r.id === 'hypoxemia')!.source).toMatch(/from memory/);
    expect(PLATEAU_DEFAULT_V1.rules.find((r) => r.id === 'low_etco2')!.source).toMatch(/from memory/);
    expect(PLATEAU_DEFAULT_V1.rules.find((r) => r.id === 'hypoventilation')!.source).toMatch(/Burton.*from memory/);
    expect(getBuiltInRuleSet('burton-2006')!.rules.find((r) => r.id === 'capnographic_change')!.source).toMatch(/from memory/);
    expect(sources('deitch-2010')).toMatch(/Deitch.*2010/);
  });

  it('keeps built-ins immutable: a change must be a new version', () => {
    expect(Object.isFrozen(PLATEAU_DEFAULT_V1)).toBe(true);
    expect(Object.isFrozen(PLATEAU_DEFAULT_V1.rules[0].terms[0])).toBe(true);
    expect(() => {
      (PLATEAU_DEFAULT_V1.rules[0] as { minDurationS: number }).minDurationS = 10;
    }).toThrow();
  });

  it('finds a rule set by id, at a version or the latest, and nothing for an unknown id', () => {
    expect(getBuiltInRuleSet('plateau-default')).toBe(PLATEAU_DEFAULT_V1);
    expect(getBuiltInRuleSet('plateau-default', 1)).toBe(PLATEAU_DEFAULT_V1);
    expect(getBuiltInRuleSet('plateau-default', 9)).toBeUndefined();
    expect(getBuiltInRuleSet('nope')).toBeUndefined();
    const ids = listBuiltInRuleSets().map((s) => `${s.id}@${s.version}`);
    expect(new Set(ids).size).toBe(ids.length);
  });

  it('rejects a rule set with duplicate rule ids, version 0, or a relative term on a channel without baseline', () => {
    const base = { id: 'x', version: 1, description: 'd', rules: [{ id: 'a', description: 'd', source: 's', terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }], combine: 'any', minDurationS: 0 }] };
    expect(ruleSetSchema.safeParse(base).success).toBe(true);
    expect(ruleSetSchema.safeParse({ ...base, version: 0 }).success).toBe(false);
    expect(ruleSetSchema.safeParse({ ...base, rules: [base.rules[0], base.rules[0]] }).success).toBe(false);
    const hr = { ...base.rules[0], terms: [{ channel: 'hr', comparator: '>', threshold: 20, relativeTo: 'baseline' }] };
    expect(ruleSetSchema.safeParse({ ...base, rules: [hr] }).success).toBe(false);
    const kindAlone = { ...base.rules[0], terms: [{ channel: 'spo2', comparator: '<', threshold: 90, relativeKind: 'percent' }] };
    expect(ruleSetSchema.safeParse({ ...base, rules: [kindAlone] }).success).toBe(false);
  });
});
