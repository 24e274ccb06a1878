import { describe, expect, it } from 'vitest';
import { analyzeCase, caseLevel, episodeLevel, majorPhysiology, PLATEAU_DEFAULT_V1 } from '@/lib/rules';
import { INTERVENTION_KINDS, INTERVENTION_LEVEL } from '@/lib/domain/intervention';
import { caseOf, manual, monitor, runs } from './_build';

describe('levels (rules.md §6)', () => {
  it('grades each intervention kind as the table of rules.md §6 says', () => {
    const byLevel = (level: string) => INTERVENTION_KINDS.filter((k) => INTERVENTION_LEVEL[k] === level).sort();
    expect(byLevel('corrected')).toEqual(['chin_lift', 'jaw_thrust', 'nasal_airway', 'oral_airway', 'oxygen_increase', 'sedation_paused', 'stimulation']);
    expect(byLevel('supported')).toEqual(['bag_mask', 'flumazenil', 'naloxone', 'procedure_stopped', 'supraglottic_airway']);
    expect(byLevel('rescued')).toEqual(['chest_compressions', 'death', 'icu_transfer', 'intubation']);
  });

  it('gives an episode the highest level among its interventions, observed with none', () => {
    expect(episodeLevel([])).toBe('observed');
    expect(episodeLevel([{ kind: 'stimulation' }, { kind: 'naloxone' }, { kind: 'jaw_thrust' }])).toBe('supported');
    expect(episodeLevel([{ kind: 'bag_mask' }, { kind: 'intubation' }])).toBe('rescued');
  });

  it('gives the case none with no episode and no intervention, observed with an episode only', () => {
    expect(caseLevel([], [])).toBe('none');
    expect(caseLevel([{}], [])).toBe('observed');
    expect(caseLevel([], [{ kind: 'oxygen_increase' }])).toBe('corrected');
  });

  it('grades the case by every intervention in it, linked to an episode or not', () => {
    const rec = caseOf([monitor('spo2', runs([97, 100], [84, 20], [97, 400]))], {
      interventions: [
        { t: 105, kind: 'oxygen_increase' },
        { t: 480, kind: 'icu_transfer' },
      ],
    });
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.episodes.map((e) => [e.rule, e.level])).toEqual([
      ['hypoxemia', 'corrected'],
      ['severe_hypoxemia', 'corrected'],
    ]);
    expect(a.caseLevel).toBe('rescued');
  });

  it('keeps a case with only spot findings at none', () => {
    expect(analyzeCase(caseOf([manual('spo2', [10], [80])]), PLATEAU_DEFAULT_V1).caseLevel).toBe('none');
  });

  it('flags majorPhysiology for prolonged apnea, prolonged hypoxemia or critical hypoxemia, whatever was done', () => {
    expect(majorPhysiology([{ rule: 'prolonged_apnea' }], PLATEAU_DEFAULT_V1)).toBe(true);
    expect(majorPhysiology([{ rule: 'prolonged_hypoxemia' }], PLATEAU_DEFAULT_V1)).toBe(true);
    expect(majorPhysiology([{ rule: 'critical_hypoxemia' }], PLATEAU_DEFAULT_V1)).toBe(true);
    expect(majorPhysiology([{ rule: 'apnea' }, { rule: 'hypoxemia' }, { rule: 'severe_hypoxemia' }], PLATEAU_DEFAULT_V1)).toBe(false);
    const rec = caseOf([monitor('spo2', runs([97, 100], [74, 3], [97, 100]))], { interventions: [{ t: 101, kind: 'stimulation' }] });
    const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
    expect(a.summary.majorPhysiology).toBe(true);
    expect(a.caseLevel).toBe('corrected');
  });
});
