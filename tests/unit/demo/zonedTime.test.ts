import { describe, expect, it } from 'vitest';
import { addDays, isoWeekday, localDateOf, subtractMonths, wallTimeAt, zonedWallTimeToUtc, zoneOffsetMinutes } from '@/lib/demo/zonedTime';

describe('wall-clock time in the unit zone (Intl time-zone data)', () => {
  it('puts 08:00 in Dublin at 08:00 UTC in winter and 07:00 UTC in summer', () => {
    // Irish Standard Time is UTC+1 from the last Sunday of March to the last Sunday of October.
    expect(new Date(zonedWallTimeToUtc({ year: 2026, month: 1, day: 5, hour: 8, minute: 0 }, 'Europe/Dublin')).toISOString()).toBe('2026-01-05T08:00:00.000Z');
    expect(new Date(zonedWallTimeToUtc({ year: 2026, month: 7, day: 1, hour: 8, minute: 0 }, 'Europe/Dublin')).toISOString()).toBe('2026-07-01T07:00:00.000Z');
    expect(zoneOffsetMinutes(Date.parse('2026-07-01T12:00:00Z'), 'Europe/Dublin')).toBe(60);
    expect(zoneOffsetMinutes(Date.parse('2026-07-01T12:00:00Z'), 'America/New_York')).toBe(-240);
  });

  it('gets working hours right on the days the clocks change', () => {
    // 2026-03-29 and 2026-10-25 are the change Sundays; the Monday after is a working day.
    expect(new Date(zonedWallTimeToUtc({ year: 2026, month: 3, day: 30, hour: 8, minute: 0 }, 'Europe/Dublin')).toISOString()).toBe('2026-03-30T07:00:00.000Z');
    expect(new Date(zonedWallTimeToUtc({ year: 2026, month: 10, day: 26, hour: 8, minute: 0 }, 'Europe/Dublin')).toISOString()).toBe('2026-10-26T08:00:00.000Z');
    expect(new Date(zonedWallTimeToUtc({ year: 2026, month: 3, day: 29, hour: 12, minute: 0 }, 'Europe/Dublin')).toISOString()).toBe('2026-03-29T11:00:00.000Z');
    const w = wallTimeAt(Date.parse('2026-10-25T16:30:00Z'), 'Europe/Dublin');
    expect([w.hour, w.minute]).toEqual([16, 30]);
  });

  it('reads the local calendar date, which can differ from the UTC one', () => {
    expect(localDateOf(Date.parse('2026-03-02T23:30:00Z'), 'Asia/Tokyo')).toBe('2026-03-03');
    expect(localDateOf(Date.parse('2026-07-01T23:30:00Z'), 'Europe/Dublin')).toBe('2026-07-02');
  });

  it('does calendar arithmetic without daylight-saving steps', () => {
    expect(addDays('2026-02-27', 2)).toBe('2026-03-01');
    expect(addDays('2024-02-28', 1)).toBe('2024-02-29');
    expect(subtractMonths('2026-08-31', 6)).toBe('2026-02-28');
    expect(subtractMonths('2026-03-04', 6)).toBe('2025-09-04');
    expect(isoWeekday('2026-03-02')).toBe(1);
    expect(isoWeekday('2026-03-08')).toBe(7);
  });
});
