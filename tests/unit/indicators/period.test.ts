import { describe, expect, it } from 'vitest';
import { formatPeriod, lastCompletePeriod, parsePeriod, periodContaining, periodsBetween, periodsEndingWith, shiftPeriod, yearEarlier } from '@/lib/indicators/period';

describe('reporting periods', () => {
  it('reads month, quarter and year labels into inclusive date bounds, leap February included', () => {
    expect(parsePeriod('2024-02')).toEqual({ kind: 'month', label: '2024-02', start: '2024-02-01', end: '2024-02-29' });
    expect(parsePeriod('2026-Q3')).toEqual({ kind: 'quarter', label: '2026-Q3', start: '2026-07-01', end: '2026-09-30' });
    expect(parsePeriod('2026')).toEqual({ kind: 'year', label: '2026', start: '2026-01-01', end: '2026-12-31' });
  });

  it('refuses labels that are not periods', () => {
    for (const bad of ['2026-13', '2026-Q5', '26', '2026-7', '2026-Q0', '', 'all']) expect(parsePeriod(bad), bad).toBeNull();
  });

  it('steps across year ends both ways', () => {
    expect(shiftPeriod(parsePeriod('2026-01')!, -1).label).toBe('2025-12');
    expect(shiftPeriod(parsePeriod('2025-Q4')!, 1).label).toBe('2026-Q1');
    expect(shiftPeriod(parsePeriod('2026-Q1')!, -5).label).toBe('2024-Q4');
    expect(yearEarlier(parsePeriod('2026-03')!).label).toBe('2025-03');
    expect(yearEarlier(parsePeriod('2026-Q3')!).label).toBe('2025-Q3');
    expect(yearEarlier(parsePeriod('2026')!).label).toBe('2025');
  });

  it('on 1 December the last complete quarter is Q3 and the last complete month November', () => {
    expect(lastCompletePeriod('quarter', '2026-12-01').label).toBe('2026-Q3');
    expect(lastCompletePeriod('month', '2026-12-01').label).toBe('2026-11');
    expect(lastCompletePeriod('year', '2026-12-01').label).toBe('2025');
    expect(periodContaining('quarter', '2026-12-31').label).toBe('2026-Q4');
  });

  it('lists the 24 chart periods oldest first, ending with the report period', () => {
    const ps = periodsEndingWith(parsePeriod('2026-09')!, 24);
    expect(ps).toHaveLength(24);
    expect(ps[0].label).toBe('2024-10');
    expect(ps[23].label).toBe('2026-09');
  });

  it('takes only whole periods between two dates', () => {
    expect(periodsBetween('month', '2026-01-15', '2026-04-30').map((p) => p.label)).toEqual(['2026-02', '2026-03', '2026-04']);
    expect(periodsBetween('quarter', '2026-01-01', '2026-08-31').map((p) => p.label)).toEqual(['2026-Q1', '2026-Q2']);
    expect(periodsBetween('year', '2026-01-02', '2026-12-31')).toEqual([]);
  });

  it('names periods for people', () => {
    expect(formatPeriod(parsePeriod('2026-07')!)).toBe('July 2026');
    expect(formatPeriod(parsePeriod('2026-Q3')!)).toBe('Q3 2026 (Jul–Sep)');
    expect(formatPeriod(parsePeriod('2026')!)).toBe('2026');
  });
});
