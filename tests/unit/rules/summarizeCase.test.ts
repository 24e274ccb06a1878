import { describe, expect, it } from 'vitest';
import { analyzeCase, PLATEAU_DEFAULT_V1, summarizeCase } from '@/lib/rules';
import { caseOf, manual, monitor, monitorAt, propofolAt, runs } from './_build';

describe('summarizeCase', () => {
  const rec = caseOf(
    [
      monitor('etco2', runs([38, 100], [0, 30], [38, 50], [0, 25], [52, 45], [38, 50])),
      monitor('rr', runs([14, 100], [0, 30], [14, 50], [0, 25], [10, 45], [14, 50])),
      monitor('spo2', runs([98, 120], [87, 30], [98, 150])),
      manual('spo2', [250], [83]),
    ],
    {
      doses: [propofolAt(60)],
      interventions: [{ t: 110, kind: 'jaw_thrust' }, { t: 190, kind: 'bag_mask' }],
      events: [{ t: 50, kind: 'sedation_start' }, { t: 290, kind: 'procedure_end' }, { t: 300, kind: 'sedation_end' }],
    },
  );
  const analysis = analyzeCase(rec, PLATEAU_DEFAULT_V1);
  const s = analysis.summary;

  it('counts episodes and total duration per rule, in the rule set order, zeros included', () => {
    expect(s.rules.map((r) => r.rule)).toEqual(PLATEAU_DEFAULT_V1.rules.map((r) => r.id));
    expect(s.rules.find((r) => r.rule === 'apnea')).toEqual({ rule: 'apnea', episodeCount: 2, totalDurationS: 55 });
    expect(s.rules.find((r) => r.rule === 'hypoventilation')).toEqual({ rule: 'hypoventilation', episodeCount: 1, totalDurationS: 45 });
    expect(s.rules.find((r) => r.rule === 'critical_hypoxemia')).toEqual({ rule: 'critical_hypoxemia', episodeCount: 0, totalDurationS: 0 });
    expect(s.episodeCount).toBe(analysis.episodes.length);
  });

  it('takes the lowest SpO2 from monitor and manual readings alike', () => {
    expect(s.lowestSpo2).toEqual({ value: 83, t: 250 });
  });

  it('records the highest and lowest EtCO2 and the lowest RR with their times', () => {
    expect(s.highestEtco2).toEqual({ value: 52, t: 205 });
    expect(s.lowestEtco2).toEqual({ value: 0, t: 100 });
    expect(s.lowestRr).toEqual({ value: 0, t: 100 });
    expect(s.etco2Unit).toBe('mmHg');
  });

  it('measures capnography coverage from sedation_start to sedation_end', () => {
    expect(s.sedationTime).toEqual({ start: 50, end: 300, startFrom: 'sedation_start', endFrom: 'sedation_end' });
    expect(s.capnographyCoveragePct).toBe(100);
  });

  it('lists the response time of every apnea episode, null where nothing was done', () => {
    expect(s.apneaResponseTimesS).toEqual([10, 10]);
    expect(s.caseLevel).toBe('supported');
    expect(s.majorPhysiology).toBe(false);
  });

  it('is the same object whether taken from analyzeCase or computed alone', () => {
    const { summary, ...core } = analysis;
    expect(summarizeCase(rec, PLATEAU_DEFAULT_V1, core)).toEqual(summary);
  });

  it('falls back from sedation_end to recovery_start to procedure_end, and from sedation_start to the first sedative dose', () => {
    const base = (events: ReturnType<typeof caseOf>['events']) =>
      analyzeCase(caseOf([monitor('etco2', runs([38, 400]))], { doses: [propofolAt(100)], events }), PLATEAU_DEFAULT_V1).summary.sedationTime;
    expect(base([{ t: 300, kind: 'procedure_end' }, { t: 350, kind: 'recovery_start' }])).toMatchObject({ start: 100, end: 350, startFrom: 'first_sedative_dose', endFrom: 'recovery_start' });
    expect(base([{ t: 300, kind: 'procedure_end' }])).toMatchObject({ end: 300, endFrom: 'procedure_end' });
    expect(base([])).toMatchObject({ end: 400, endFrom: 'end_of_monitoring' });
  });

  it('counts only EtCO2 monitor coverage: 99 s covered of 200 s of sedation is 49.5 %', () => {
    const t = [...Array.from({ length: 70 }, (_, i) => i), ...Array.from({ length: 200 }, (_, i) => 200 + i)];
    const rec2 = caseOf([monitorAt('etco2', t, t.map(() => 38)), monitor('spo2', runs([98, 400]))], {
      events: [{ t: 0, kind: 'sedation_start' }, { t: 200, kind: 'sedation_end' }],
    });
    // covered 0–99 (the sample at 69 s holds 30 s), sedation 0–200
    expect(analyzeCase(rec2, PLATEAU_DEFAULT_V1).summary.capnographyCoveragePct).toBe(49.5);
  });

  it('has no coverage figure without a sedation time', () => {
    const s2 = analyzeCase(caseOf([monitor('etco2', runs([38, 100]))]), PLATEAU_DEFAULT_V1).summary;
    expect(s2.sedationTime).toBeNull();
    expect(s2.capnographyCoveragePct).toBeNull();
  });
});
