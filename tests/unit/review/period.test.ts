import { describe, expect, it } from 'vitest';
import { addDays, lastFullMonth, monthEnd, monthPeriod, monthsBetween, periodLabel, referencePeriod, resolvePeriod, shiftMonth } from '@/lib/review';

describe('review periods', () => {
  it('shifts months across years and knows month ends, leap Februaries included', () => {
    expect(shiftMonth('2026-01', -1)).toBe('2025-12');
    expect(shiftMonth('2026-11', 14)).toBe('2028-01');
    expect(monthEnd('2028-02')).toBe('2028-02-29');
    expect(monthEnd('2100-02')).toBe('2100-02-28');
    expect(monthEnd('2026-04')).toBe('2026-04-30');
    expect(addDays('2026-03-01', -1)).toBe('2026-02-28');
  });

  it('defaults to the last full month before today', () => {
    expect(lastFullMonth('2026-12-01')).toBe('2026-11');
    expect(lastFullMonth('2027-01-31')).toBe('2026-12');
    expect(resolvePeriod({}, '2026-12-01')).toEqual({ from: '2026-11-01', to: '2026-11-30', month: '2026-11' });
  });

  it('takes a month or any range, and knows when a range is a whole month', () => {
    expect(resolvePeriod({ month: '2026-02' }, '2026-12-01')).toEqual(monthPeriod('2026-02'));
    expect(resolvePeriod({ from: '2026-03-01', to: '2026-03-31' }, '2026-12-01').month).toBe('2026-03');
    expect(resolvePeriod({ from: '2026-03-10', to: '2026-05-02' }, '2026-12-01')).toEqual({ from: '2026-03-10', to: '2026-05-02', month: null });
  });

  it('takes the six calendar months before the period as its reference', () => {
    expect(referencePeriod(monthPeriod('2026-11'))).toEqual({ from: '2026-05-01', to: '2026-10-31', month: null });
    expect(referencePeriod({ from: '2026-03-10', to: '2026-05-02', month: null })).toEqual({ from: '2025-09-01', to: '2026-03-09', month: null });
    expect(monthsBetween('2026-05-01', '2026-11-30')).toHaveLength(7);
  });

  it('names a period', () => {
    expect(periodLabel(monthPeriod('2026-11'))).toBe('November 2026');
    expect(periodLabel({ from: '2026-03-10', to: '2026-05-02', month: null })).toBe('2026-03-10 to 2026-05-02');
  });
});
