import { readFileSync } from 'node:fs';
import path from 'node:path';
import { describe, expect, it } from 'vitest';
import { analyzeCase, getBuiltInRuleSet, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { parseCaseFile } from '@/lib/ingest/caseFile';
import { caseOf, monitor, propofolAt, runs } from './_build';

const fixture = (name: string) => parseCaseFile(readFileSync(path.join(__dirname, '../../fixtures/cases', name), 'utf8'));

describe('analyzeCase (rules.md §7)', () => {
  it('returns exactly the keys of the §7 result, naming the rule set id and version', () => {
    const a = analyzeCase(fixture('apnea-jaw-thrust.json'), PLATEAU_DEFAULT_V1);
    expect(Object.keys(a)).toEqual(['ruleSet', 'baseline', 'episodes', 'spotFindings', 'skipped', 'caseLevel', 'summary']);
    expect(a.ruleSet).toEqual({ id: 'plateau-default', version: 1 });
    expect(a.summary.ruleSet).toEqual({ id: 'plateau-default', version: 1 });
    expect(JSON.parse(JSON.stringify(a))).toEqual(a);
  });

  it('first the patient stops breathing, the nurse thrusts the jaw 15 s later, then SpO2 dips: two episodes, corrected', () => {
    const a = analyzeCase(fixture('apnea-jaw-thrust.json'), PLATEAU_DEFAULT_V1);
    expect(a.episodes.map((e) => [e.rule, e.start, e.end, e.responseS, e.level])).toEqual([
      ['apnea', 400, 445, 15, 'corrected'],
      ['hypoxemia', 430, 470, 10, 'corrected'],
    ]);
    expect(a.episodes[0].onsetAbrupt).toBe(true);
    expect(a.episodes[0].lastSedativeDose?.t).toBe(360);
    expect(a.caseLevel).toBe('corrected');
  });

  it('sorts episodes by start, then rule id', () => {
    // apnea and hypoxemia start together at 100
    const rec = caseOf([
      monitor('etco2', runs([38, 100], [0, 70], [38, 100])),
      monitor('spo2', runs([97, 100], [88, 70], [97, 100])),
    ]);
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.episodes.map((e) => [e.start, e.rule])).toEqual([
      [100, 'apnea'],
      [100, 'hypoxemia'],
      [100, 'prolonged_apnea'],
      [100, 'prolonged_hypoxemia'],
    ]);
  });

  it('finds the hypoventilation in the kPa fixture and reports it in kPa', () => {
    const a = analyzeCase(fixture('kpa-hypoventilation.json'), PLATEAU_DEFAULT_V1);
    expect(a.baseline).toEqual({ etco2: 5.1, spo2: 96, rr: 12, etco2Unit: 'kPa' });
    expect(a.episodes.map((e) => [e.rule, e.start, e.end])).toEqual([['hypoventilation', 300, 400]]);
    expect(a.episodes[0].extremes[0]).toMatchObject({ value: 6.9, unit: 'kPa' });
  });

  it('does not change its input record', () => {
    const rec = caseOf([monitor('etco2', runs([5, 200]), { unit: 'kPa' })], { doses: [propofolAt(150)] });
    const before = JSON.stringify(rec);
    analyzeCase(rec, getBuiltInRuleSet('plateau-default')!);
    expect(JSON.stringify(rec)).toBe(before);
  });

  it('honours a shorter maxHold and a longer response window from the options', () => {
    const t = [...Array.from({ length: 100 }, (_, i) => i), 120, ...Array.from({ length: 50 }, (_, i) => 200 + i)];
    const v = [...runs([97, 99]), 85, 85, ...runs([97, 50])];
    const rec = caseOf([{ channel: 'spo2', unit: '%', source: 'monitor', t, v }], { interventions: [{ t: 260, kind: 'stimulation' }] });
    const long = analyzeCase(rec, PLATEAU_DEFAULT_V1).episodes.find((e) => e.rule === 'hypoxemia')!;
    expect([long.start, long.end, long.censoredAt]).toEqual([99, 150, 'end']);
    expect(analyzeCase(rec, PLATEAU_DEFAULT_V1, { maxHoldS: 10 }).episodes.find((e) => e.rule === 'hypoxemia')).toBeUndefined();
    expect(analyzeCase(rec, PLATEAU_DEFAULT_V1).episodes[0].responseS).toBeNull();
    expect(analyzeCase(rec, PLATEAU_DEFAULT_V1, { responseWindowS: 120 }).episodes[0].responseS).toBe(161);
  });
});
