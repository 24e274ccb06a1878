import { describe, expect, it } from 'vitest';
import { analyzeCase, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { caseOf, manual, monitor, oneRule, propofolAt, runs } from './_build';

describe('spot findings (rules.md §1)', () => {
  it('reports a manual SpO2 of 88 % under every rule whose threshold it passes, without an episode', () => {
    const a = analyzeCase(caseOf([manual('spo2', [60, 300, 600], [97, 88, 84])]), PLATEAU_DEFAULT_V1);
    expect(a.episodes).toEqual([]);
    expect(a.spotFindings.map((f) => [f.t, f.rule, f.value])).toEqual([
      [300, 'hypoxemia', 88],
      [300, 'prolonged_hypoxemia', 88],
      [600, 'hypoxemia', 84],
      [600, 'prolonged_hypoxemia', 84],
      [600, 'severe_hypoxemia', 84],
    ]);
    expect(a.spotFindings[0]).toEqual({ rule: 'hypoxemia', channel: 'spo2', t: 300, value: 88, unit: '%' });
  });

  it('reports a manual RR of 0 as an apnea finding and a manual RR of 6 as bradypnea', () => {
    const a = analyzeCase(caseOf([manual('rr', [100, 200], [0, 6])]), PLATEAU_DEFAULT_V1);
    expect(a.spotFindings.map((f) => [f.t, f.rule])).toEqual([
      [100, 'apnea'],
      [100, 'prolonged_apnea'],
      [200, 'bradypnea'],
    ]);
  });

  it('ignores a manual SpO2 of 0: an unobserved reading, not hypoxemia', () => {
    expect(analyzeCase(caseOf([manual('spo2', [100], [0])]), PLATEAU_DEFAULT_V1).spotFindings).toEqual([]);
  });

  it('applies baseline-relative thresholds to manual readings once the monitor gave a baseline', () => {
    const rec = caseOf([monitor('etco2', runs([38, 200])), manual('etco2', [400], [49])], { doses: [propofolAt(150)] });
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.spotFindings).toEqual([{ rule: 'hypoventilation', channel: 'etco2', t: 400, value: 49, unit: 'mmHg' }]);
  });

  it('shows a manual kPa reading in kPa when the case displays kPa', () => {
    const a = analyzeCase(caseOf([manual('etco2', [100], [7.2], 'kPa')], { etco2Unit: 'kPa' }), PLATEAU_DEFAULT_V1);
    expect(a.spotFindings).toEqual([{ rule: 'hypoventilation', channel: 'etco2', t: 100, value: 7.2, unit: 'kPa' }]);
  });

  it('needs the other channel of an AND rule to hold on its monitor at that instant', () => {
    const rs = oneRule({
      id: 'slow_and_low',
      terms: [
        { channel: 'rr', comparator: '<', threshold: 8 },
        { channel: 'spo2', comparator: '<', threshold: 90 },
      ],
      combine: 'all',
      minDurationS: 30,
    });
    const rec = caseOf([monitor('spo2', runs([97, 100], [85, 100])), manual('rr', [50, 150], [6, 6])]);
    expect(analyzeCase(rec, rs).spotFindings.map((f) => f.t)).toEqual([150]);
  });
});
