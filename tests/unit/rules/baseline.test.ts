import { describe, expect, it } from 'vitest';
import { analyzeCase, computeBaseline, coverCase, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { caseOf, monitor, monitorAt, propofolAt, runs } from './_build';

const baselineOf = (rec: ReturnType<typeof caseOf>) => computeBaseline(rec, coverCase(rec));

describe('baselines (rules.md §3)', () => {
  it('takes the median of the 120 s before the first sedative dose', () => {
    // 0–79 s at 30 mmHg, 80–199 s at 38 / 40 alternating, dose at 200 s
    const v = [...runs([30, 80]), ...Array.from({ length: 120 }, (_, i) => (i % 2 === 0 ? 38 : 40)), ...runs([45, 100])];
    expect(baselineOf(caseOf([monitor('etco2', v)], { doses: [propofolAt(200)] })).etco2).toBe(39);
  });

  it('ignores a non-sedative dose when finding the first sedative dose', () => {
    const v = [...runs([30, 100]), ...runs([40, 100])];
    const doses = [{ t: 50, drug: 'ondansetron', amount: 4, unit: 'mg' as const, route: 'IV' }, propofolAt(200)];
    expect(baselineOf(caseOf([monitor('etco2', v)], { doses })).etco2).toBe(40);
  });

  it('counts an opioid as a sedative dose', () => {
    const v = [...runs([30, 100]), ...runs([40, 100])];
    const doses = [{ t: 100, drug: 'fentanyl', amount: 50, unit: 'mcg' as const, route: 'IV' }, propofolAt(200)];
    expect(baselineOf(caseOf([monitor('etco2', v)], { doses })).etco2).toBe(30);
  });

  it('falls back to the first 120 s of monitoring before any dose when fewer than 3 samples precede the dose', () => {
    // monitoring 0–59 s at 36, then a gap, then samples from 400; dose at 300: window 180–300 is empty
    const t = [...Array.from({ length: 60 }, (_, i) => i), ...Array.from({ length: 60 }, (_, i) => 400 + i)];
    const v = [...runs([36, 60]), ...runs([44, 60])];
    expect(baselineOf(caseOf([monitorAt('etco2', t, v)], { doses: [propofolAt(300)] })).etco2).toBe(36);
  });

  it('uses exactly 3 samples but not 2', () => {
    const three = caseOf([monitorAt('etco2', [197, 198, 199, 400], [37, 39, 41, 50])], { doses: [propofolAt(200)] });
    expect(baselineOf(three).etco2).toBe(39);
    const two = caseOf([monitorAt('etco2', [198, 199, 400], [37, 39, 50])], { doses: [propofolAt(200)] });
    expect(baselineOf(two).etco2).toBeNull();
  });

  it('uses the first 120 s of monitoring when there is no dose at all', () => {
    expect(baselineOf(caseOf([monitor('spo2', [...runs([99, 120]), ...runs([90, 200])])])).spo2).toBe(99);
  });

  it('is null when monitoring starts after the first dose, and the case lists what was skipped', () => {
    const rec = caseOf([monitor('etco2', runs([40, 300]), { t0: 200 }), monitor('spo2', runs([97, 300]), { t0: 200 })], { doses: [propofolAt(100)] });
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.baseline).toEqual({ etco2: null, spo2: null, rr: null, etco2Unit: 'mmHg' });
    expect(a.skipped).toEqual([
      { rule: 'hypoventilation', reason: 'no EtCO2 baseline', dropped: 'term', term: 1 },
      { rule: 'low_etco2', reason: 'no EtCO2 baseline', dropped: 'rule' },
    ]);
  });

  it('still runs absolute rules without any baseline', () => {
    const rec = caseOf([monitor('etco2', [...runs([40, 100]), ...runs([55, 40]), ...runs([40, 60])], { t0: 200 })], { doses: [propofolAt(100)] });
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.episodes.map((e) => [e.rule, e.start, e.end])).toEqual([['hypoventilation', 300, 340]]);
  });

  it('leaves probe-off SpO2 samples out of the baseline', () => {
    const v = runs([96, 60], [40, 60], [85, 10]);
    const probeOff = v.map((_, i) => i >= 60 && i < 120);
    expect(baselineOf(caseOf([monitor('spo2', v, { probeOff })], { doses: [propofolAt(120)] })).spo2).toBe(96);
  });
});
