import { describe, expect, it } from 'vitest';
import { analyzeCase, PLATEAU_DEFAULT_V1, CONWAY_2019_V1 } from '@/lib/rules';
import type { InterventionEntry } from '@/lib/domain/caseRecord';
import { caseOf, monitor, propofolAt, runs } from './_build';

/** EtCO2 and RR at 1 Hz with an apnea from 100 s lasting `len` s; `onset` sets the values just before it. */
function apneaCase(opts: { onset?: number[]; len?: number; interventions?: InterventionEntry[]; doses?: ReturnType<typeof propofolAt>[] } = {}) {
  const onset = opts.onset ?? [];
  const len = opts.len ?? 30;
  const et = [...runs([38, 100 - onset.length]), ...onset, ...runs([0, len], [38, 100])];
  const rr = runs([14, 100], [14, len], [14, 100]);
  return caseOf([monitor('etco2', et), monitor('rr', rr), monitor('spo2', runs([98, 200 + len]))], {
    interventions: opts.interventions,
    doses: opts.doses ?? [propofolAt(20)],
  });
}

const apnea = (rec: ReturnType<typeof caseOf>) => analyzeCase(rec, PLATEAU_DEFAULT_V1).episodes.find((e) => e.rule === 'apnea')!;

describe('episode facts (rules.md §5)', () => {
  it('flags an abrupt onset when EtCO2 falls from 38 to 0 mmHg between two samples', () => {
    expect(apnea(apneaCase()).onsetAbrupt).toBe(true);
  });

  it('flags an abrupt onset for a fall from exactly 25 mmHg within exactly 5 s', () => {
    expect(apnea(apneaCase({ onset: [25, 20, 15, 10, 5] })).onsetAbrupt).toBe(true);
  });

  it('does not flag a fall that took 6 s, or one that started below 25 mmHg', () => {
    expect(apnea(apneaCase({ onset: [25, 20, 16, 12, 9, 6] })).onsetAbrupt).toBe(false);
    expect(apnea(apneaCase({ onset: [24, 22, 20, 18, 15, 10] })).onsetAbrupt).toBe(false);
  });

  it('leaves onsetAbrupt null for rules that are not apnea-type', () => {
    const rec = caseOf([monitor('spo2', runs([97, 100], [85, 30], [97, 10]))]);
    expect(analyzeCase(rec, PLATEAU_DEFAULT_V1).episodes.every((e) => e.onsetAbrupt === null)).toBe(true);
  });

  it("treats Conway's EtCO2 = 0 apnea as apnea-type too", () => {
    const e = analyzeCase(apneaCase(), CONWAY_2019_V1).episodes.find((x) => x.rule === 'apnea')!;
    expect(e.onsetAbrupt).toBe(true);
  });

  it('links the last sedative dose before the start and the seconds since it', () => {
    const e = apnea(apneaCase({ doses: [propofolAt(20), propofolAt(70), propofolAt(100), { t: 90, drug: 'naloxone', amount: 0.4, unit: 'mg', route: 'IV' }] }));
    expect(e.lastSedativeDose).toEqual({ t: 70, drug: 'propofol', amount: 40, unit: 'mg', route: 'IV' });
    expect(e.sinceLastSedativeDoseS).toBe(30);
  });

  it('has no last dose when every sedative dose came after the start', () => {
    const e = apnea(apneaCase({ doses: [propofolAt(150)] }));
    expect(e.lastSedativeDose).toBeNull();
    expect(e.sinceLastSedativeDoseS).toBeNull();
  });

  it('links interventions from the start to 60 s after the end, both ends included', () => {
    // apnea 100–130: window [100, 190]
    const interventions: InterventionEntry[] = [
      { t: 99, kind: 'stimulation' },
      { t: 100, kind: 'chin_lift' },
      { t: 190, kind: 'bag_mask' },
      { t: 191, kind: 'intubation' },
    ];
    const e = apnea(apneaCase({ interventions }));
    expect(e.interventions.map((i) => [i.t, i.kind, i.level])).toEqual([
      [100, 'chin_lift', 'corrected'],
      [190, 'bag_mask', 'supported'],
    ]);
    expect(e.responseS).toBe(0);
    expect(e.level).toBe('supported');
  });

  it('measures the response time from the start to the first linked intervention', () => {
    const e = apnea(apneaCase({ interventions: [{ t: 135, kind: 'naloxone' }, { t: 112, kind: 'jaw_thrust' }] }));
    expect(e.responseS).toBe(12);
    expect(e.level).toBe('supported');
  });

  it('has a null response and level observed when nothing was done', () => {
    const e = apnea(apneaCase());
    expect(e.responseS).toBeNull();
    expect(e.interventions).toEqual([]);
    expect(e.level).toBe('observed');
  });

  it('reports the nadir SpO2 and its time, and the peak EtCO2 for hypoventilation', () => {
    const sp = [...runs([97, 100]), 89, 88, 86, 84, 86, 88, 89, ...runs([89, 20]), ...runs([97, 50])];
    const et = runs([38, 100], [51, 10], [56, 1], [52, 30], [38, 50]);
    const a = analyzeCase(caseOf([monitor('spo2', sp), monitor('etco2', et)], { doses: [propofolAt(50)] }), PLATEAU_DEFAULT_V1);
    const hypox = a.episodes.find((e) => e.rule === 'hypoxemia')!;
    expect(hypox.extremes).toEqual([{ channel: 'spo2', kind: 'lowest', value: 84, unit: '%', t: 103 }]);
    const hypov = a.episodes.find((e) => e.rule === 'hypoventilation')!;
    expect(hypov.extremes).toEqual([{ channel: 'etco2', kind: 'highest', value: 56, unit: 'mmHg', t: 110 }]);
  });

  it('reports the lowest EtCO2 and lowest RR of an apnea', () => {
    const e = apnea(apneaCase());
    expect(e.extremes.map((x) => [x.channel, x.kind, x.value])).toEqual([
      ['etco2', 'lowest', 0],
      ['rr', 'lowest', 14],
    ]);
  });
});
