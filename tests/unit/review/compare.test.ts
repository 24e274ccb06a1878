import { describe, expect, it } from 'vitest';
import { compareReview, proportion } from '@/lib/review';
import { LEVEL_LABEL, ruleLabel } from '@/lib/domain/ruleLabel';
import { row } from './_rows';

const a = { id: 'plateau-default', version: 1 };
const b = { id: 'kestrel-bay-local', version: 2 };

describe('comparing a period under two rule sets', () => {
  // The same four cases under A and B: B's apnea needs 30 s, so case 2's 25 s apnea vanishes;
  // case 3 gains a desaturation rule B alone has; case 4 has no summary under B yet.
  const ra = [row({ caseId: 'c1', episodes: { apnea: 1 } }), row({ caseId: 'c2', episodes: { apnea: 1 }, summary: { caseLevel: 'corrected', firstApneaResponseS: 70 } }), row({ caseId: 'c3' }), row({ caseId: 'c4', episodes: { apnea: 1 } })];
  const rb = [
    row({ caseId: 'c1', episodes: { apnea: 1, desaturation: 0 } }),
    row({ caseId: 'c2', episodes: { apnea: 0, desaturation: 0 }, summary: { caseLevel: 'corrected', firstApneaResponseS: null } }),
    row({ caseId: 'c3', episodes: { apnea: 0, desaturation: 1 } }),
    row({ caseId: 'c4', summary: null }),
  ];
  const c = compareReview(ra, rb, { a, b, responseLimitS: 60, ruleIdsA: ['apnea', 'prolonged_apnea', 'hypoxemia'], ruleIdsB: ['apnea', 'desaturation'] });

  it('compares over the cases both rule sets have a summary for, and counts the rest', () => {
    expect(c.cases).toBe(3);
    expect(c.missingB).toBe(1);
    expect(c.missingA).toBe(0);
  });

  it('shows each figure side by side with the cases it gains and loses', () => {
    const apnea = c.figures.find((f) => f.id === 'rule:apnea')!;
    expect(apnea.a).toEqual(proportion(2, 3));
    expect(apnea.b).toEqual(proportion(1, 3));
    expect([apnea.onlyA, apnea.onlyB]).toEqual([1, 0]);
    const desat = c.figures.find((f) => f.id === 'rule:desaturation')!;
    expect(desat.a).toBeNull();
    expect(desat.b).toEqual(proportion(1, 3));
    expect(c.figures.find((f) => f.id === 'rule:hypoxemia')!.b).toBeNull();
    const queue = c.figures.find((f) => f.id === 'in_review_queue')!;
    expect([queue.a?.numerator, queue.b?.numerator]).toEqual([1, 0]);
  });

  it('lists each case that changes, and what changes', () => {
    expect(c.changedCases.map((x) => x.caseId)).toEqual(['c2', 'c3']);
    expect(c.changedCases[0].changes).toEqual(['episodes (all rules): 1 → 0', `${ruleLabel('apnea')}: 1 → 0 episodes`, 'leaves the review queue']);
    expect(c.changedCases[1].changes).toEqual([`case level: ${LEVEL_LABEL.none} → ${LEVEL_LABEL.observed}`, 'episodes (all rules): 0 → 1']);
    expect(c.changedCases[1]).toMatchObject({ a: { caseLevel: 'none', episodes: 0, inQueue: false }, b: { caseLevel: 'observed', episodes: 1, inQueue: false } });
  });

  it('finds no change between a rule set and itself', () => {
    const same = compareReview(ra, ra, { a, b: a, responseLimitS: 60 });
    expect(same.changedCases).toEqual([]);
    expect(same.figures.every((f) => f.onlyA === 0 && f.onlyB === 0)).toBe(true);
  });
});
