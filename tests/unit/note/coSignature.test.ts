import { describe, expect, it } from 'vitest';
import { coSignatureNeeded } from '@/lib/note';
import type { CaseLevel } from '@/lib/domain/intervention';
import { composed, manyEpisodesCase, quietCase } from '@/tests/fixtures/notes/cases';

describe('coSignatureNeeded: when a second clinician signs', () => {
  const cases: [CaseLevel, boolean, boolean][] = [
    ['none', false, false],
    ['observed', false, false],
    ['corrected', false, false],
    ['supported', false, true],
    ['rescued', false, true],
    ['observed', true, true],
    ['corrected', true, true],
  ];
  for (const [level, major, expected] of cases) {
    it(`${expected ? 'asks' : 'does not ask'} for a co-signature at level ${level}${major ? ' with major physiology' : ''}`, () => {
      expect(coSignatureNeeded({ caseLevel: level, summary: { majorPhysiology: major } })).toBe(expected);
    });
  }

  it('asks after bag-mask ventilation (supported) but not for a quiet case', () => {
    expect(coSignatureNeeded(composed(manyEpisodesCase()).analysis)).toBe(true);
    expect(coSignatureNeeded(composed(quietCase()).analysis)).toBe(false);
  });

  it('asks after a prolonged hypoxemia even when only a jaw thrust was given (major physiology, level corrected)', () => {
    const r = manyEpisodesCase();
    r.interventions = r.interventions.map((i) => (i.kind === 'bag_mask' ? { t: i.t, kind: 'jaw_thrust' } : i));
    const { analysis, note } = composed(r);
    expect(analysis.caseLevel).toBe('corrected');
    expect(analysis.summary.majorPhysiology).toBe(true);
    expect(note.caseLevel.coSignatureNeeded).toBe(true);
  });
});
