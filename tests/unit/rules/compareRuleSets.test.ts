import { describe, expect, it } from 'vitest';
import { compareRuleSets, MASON_2012_V1, PLATEAU_DEFAULT_V1, type RuleSet } from '@/lib/rules';
import { caseOf, monitor, runs } from './_build';

/** plateau-default v2 as an editor would save it: hypoxemia needs 30 s instead of 15 s. */
const v2: RuleSet = {
  ...PLATEAU_DEFAULT_V1,
  version: 2,
  rules: PLATEAU_DEFAULT_V1.rules.map((r) => (r.id === 'hypoxemia' ? { ...r, minDurationS: 30 } : r)),
};

const rec = caseOf([
  monitor('etco2', runs([38, 100], [0, 25], [38, 300])),
  monitor('spo2', runs([97, 200], [88, 20], [97, 50], [88, 40], [97, 115])),
]);

describe('compareRuleSets', () => {
  it('reports that a 20 s desaturation vanished when hypoxemia needs 30 s in version 2, and the 40 s one stayed', () => {
    const c = compareRuleSets(rec, PLATEAU_DEFAULT_V1, v2);
    expect(c.a).toEqual({ id: 'plateau-default', version: 1 });
    expect(c.b).toEqual({ id: 'plateau-default', version: 2 });
    const hyp = c.rules.find((r) => r.rule === 'hypoxemia')!;
    expect(hyp.status).toBe('different');
    expect(hyp.vanished.map((e) => [e.start, e.end])).toEqual([[200, 220]]);
    expect(hyp.appeared).toEqual([]);
    expect(hyp.unchanged).toBe(1);
    expect(c.rules.find((r) => r.rule === 'apnea')!.status).toBe('same');
  });

  it('reports rules present in only one set, and episodes that appeared under them', () => {
    const c = compareRuleSets(rec, PLATEAU_DEFAULT_V1, MASON_2012_V1);
    const desat = c.rules.find((r) => r.rule === 'desaturation')!;
    expect([desat.inA, desat.inB]).toEqual([false, true]);
    expect(desat.appeared.map((e) => [e.start, e.end])).toEqual([
      [200, 220],
      [270, 310],
    ]);
    const hyp = c.rules.find((r) => r.rule === 'hypoxemia')!;
    expect([hyp.inA, hyp.inB, hyp.vanished.length]).toEqual([true, false, 2]);
  });

  it('reports changed bounds of an overlapping episode with the fields that differ', () => {
    const longer: RuleSet = {
      ...PLATEAU_DEFAULT_V1,
      version: 3,
      rules: PLATEAU_DEFAULT_V1.rules.map((r) => (r.id === 'apnea' ? { ...r, terms: [{ channel: 'etco2' as const, comparator: '<' as const, threshold: 40 }] } : r)),
    };
    const c = compareRuleSets(rec, PLATEAU_DEFAULT_V1, longer);
    const apnea = c.rules.find((r) => r.rule === 'apnea')!;
    expect(apnea.changed).toHaveLength(1);
    expect(apnea.changed[0].fields).toEqual(['start', 'end', 'censored']);
  });
});
