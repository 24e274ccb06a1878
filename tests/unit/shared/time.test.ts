import { describe, expect, it } from 'vitest';
import { atClockTimeNear, localDate } from '@/lib/_shared/time';

describe('re-timing an entry to a typed clock time', () => {
  it('moves it to that second on the same day', () => {
    expect(atClockTimeNear(Date.parse('2026-03-02T09:41:30.852Z'), 9, 38, 0, 'UTC')).toBe(Date.parse('2026-03-02T09:38:00Z'));
  });
  it('crosses midnight forward when the typed time is just after it', () => {
    expect(atClockTimeNear(Date.parse('2026-12-01T23:43:10.500Z'), 0, 8, 5, 'Europe/Dublin')).toBe(Date.parse('2026-12-02T00:08:05Z'));
  });
  it('crosses midnight backward when the typed time is just before it', () => {
    expect(atClockTimeNear(Date.parse('2026-12-02T00:05:00Z'), 23, 58, 0, 'Europe/Dublin')).toBe(Date.parse('2026-12-01T23:58:00Z'));
  });
  it('reads the typed time in the unit’s zone (summer time in Dublin is UTC+1)', () => {
    expect(atClockTimeNear(Date.parse('2026-07-01T08:00:00Z'), 9, 30, 0, 'Europe/Dublin')).toBe(Date.parse('2026-07-01T08:30:00Z'));
    expect(localDate(new Date('2026-07-01T23:30:00Z'), 'Europe/Dublin')).toBe('2026-07-02');
  });
});
