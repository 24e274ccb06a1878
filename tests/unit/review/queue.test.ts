import { describe, expect, it } from 'vitest';
import { queueReasons, reviewQueue } from '@/lib/review';
import { row } from './_rows';

const OPTS = { responseLimitS: 60 };

describe('the review queue rule', () => {
  it('takes cases at level supported or rescued', () => {
    expect(queueReasons(row({ episodes: { apnea: 1 }, summary: { caseLevel: 'supported' } }), OPTS)).toEqual(['supported_or_above']);
    expect(queueReasons(row({ summary: { caseLevel: 'rescued' } }), OPTS)).toEqual(['supported_or_above']);
    expect(queueReasons(row({ episodes: { apnea: 1 }, summary: { caseLevel: 'corrected' } }), OPTS)).toEqual([]);
  });

  it('takes cases with major physiology whatever was done', () => {
    expect(queueReasons(row({ episodes: { prolonged_apnea: 1 }, summary: { caseLevel: 'observed', majorPhysiology: true } }), OPTS)).toEqual(['major_physiology']);
  });

  it('takes a first response to apnea strictly slower than the unit limit', () => {
    const at = (s: number | null) => row({ episodes: { apnea: 1 }, summary: { caseLevel: 'corrected', firstApneaResponseS: s } });
    expect(queueReasons(at(60), OPTS)).toEqual([]);
    expect(queueReasons(at(60.5), OPTS)).toEqual(['slow_apnea_response']);
    expect(queueReasons(at(61), { responseLimitS: 90 })).toEqual([]);
    expect(queueReasons(at(null), OPTS)).toEqual([]);
  });

  it('lists every reason that applies, and judges no case without a summary', () => {
    expect(queueReasons(row({ episodes: { apnea: 1 }, summary: { caseLevel: 'supported', majorPhysiology: true, firstApneaResponseS: 120 } }), OPTS)).toEqual(['supported_or_above', 'major_physiology', 'slow_apnea_response']);
    expect(queueReasons(row({ summary: null }), OPTS)).toEqual([]);
  });

  it('keeps the rows in order and only those with a reason', () => {
    const rows = [row(), row({ summary: { caseLevel: 'rescued' } }), row(), row({ summary: { majorPhysiology: true } })];
    expect(reviewQueue(rows, OPTS).map((e) => e.row.caseId)).toEqual([rows[1].caseId, rows[3].caseId]);
  });
});

describe('queue membership as a yes/no', () => {
  it('agrees with the list of reasons', async () => {
    const { inReviewQueue } = await import('@/lib/review');
    const cases = [row(), row({ summary: { caseLevel: 'supported' } }), row({ summary: { majorPhysiology: true } }), row({ episodes: { apnea: 1 }, summary: { firstApneaResponseS: 61 } }), row({ episodes: { apnea: 1 }, summary: { firstApneaResponseS: 60 } }), row({ summary: null })];
    for (const c of cases) expect(inReviewQueue(c, OPTS)).toBe(queueReasons(c, OPTS).length > 0);
  });
});
