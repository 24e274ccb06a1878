import { describe, expect, it } from 'vitest';
import { ReviewInput, REVIEW_CATEGORIES, REVIEW_CATEGORY_LABEL, REVIEW_CATEGORY_MEANING, ReviewPeriodQuery } from '@/lib/domain/review';

describe('what the lead sends with a review', () => {
  it('accepts a review in progress without a category', () => {
    expect(ReviewInput.parse({ status: 'to_review', comment: 'look at the dosing', version: 0 })).toMatchObject({ status: 'to_review', version: 0 });
  });

  it('asks for a contributing-factor category before a case is marked reviewed', () => {
    const r = ReviewInput.safeParse({ status: 'reviewed', version: 1 });
    expect(r.success).toBe(false);
    expect(r.error?.issues[0].path).toEqual(['category']);
    expect(ReviewInput.safeParse({ status: 'reviewed', category: 'dosing', version: 1 }).success).toBe(true);
  });

  it('refuses categories not on Plateau’s list, and versions that are not whole numbers', () => {
    expect(ReviewInput.safeParse({ status: 'reviewed', category: 'bad luck', version: 1 }).success).toBe(false);
    expect(ReviewInput.safeParse({ status: 'to_review', version: 1.5 }).success).toBe(false);
  });

  it('labels and explains every category', () => {
    for (const c of REVIEW_CATEGORIES) {
      expect(REVIEW_CATEGORY_LABEL[c].length).toBeGreaterThan(3);
      expect(REVIEW_CATEGORY_MEANING[c].length).toBeGreaterThan(10);
    }
  });

  it('reads a period as a month or a range, not half of one', () => {
    expect(ReviewPeriodQuery.safeParse({ month: '2026-11' }).success).toBe(true);
    expect(ReviewPeriodQuery.safeParse({ month: '2026-13' }).success).toBe(false);
    expect(ReviewPeriodQuery.safeParse({ from: '2026-11-01' }).success).toBe(false);
    expect(ReviewPeriodQuery.safeParse({ from: '2026-11-05', to: '2026-11-01' }).success).toBe(false);
  });
});
