/**
 * Formats a UTC instant in a unit's time zone (times are stored in UTC, shown locally).
 * @example formatClock(new Date('2026-03-02T09:05:00Z'), 'Europe/Dublin') //=> "09:05"
 */
export function formatClock(at: Date, timeZone: string, withSeconds = false): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: withSeconds ? '2-digit' : undefined, hourCycle: 'h23' }).format(at);
}

/** @example formatDate(new Date('2026-03-02T09:05:00Z'), 'Europe/Dublin') //=> "2 Mar 2026" */
export function formatDate(at: Date, timeZone: string): string {
  return new Intl.DateTimeFormat('en-GB', { timeZone, day: 'numeric', month: 'short', year: 'numeric' }).format(at);
}

/** The calendar date (YYYY-MM-DD) of an instant in a zone. */
export function localDate(at: Date, timeZone: string): string {
  const parts = new Intl.DateTimeFormat('en-CA', { timeZone, year: 'numeric', month: '2-digit', day: '2-digit' }).formatToParts(at);
  const get = (t: string) => parts.find((p) => p.type === t)?.value ?? '';
  return `${get('year')}-${get('month')}-${get('day')}`;
}

/** Whole years between a birth date (YYYY-MM-DD) and an instant. */
export function ageInYears(birthDate: string, at: Date): number | null {
  const m = /^(\d{4})-(\d{2})-(\d{2})$/.exec(birthDate);
  if (!m) return null;
  const [y, mo, d] = [Number(m[1]), Number(m[2]), Number(m[3])];
  let age = at.getUTCFullYear() - y;
  if (at.getUTCMonth() + 1 < mo || (at.getUTCMonth() + 1 === mo && at.getUTCDate() < d)) age--;
  return age;
}

/**
 * The instant a typed wall-clock time (HH:MM[:SS], in the unit's zone) means for an entry made at
 * `atMs`: its occurrence nearest the entry, across midnight too, on that exact second.
 * @example atClockTimeNear(Date.parse('2026-12-01T23:43:10Z'), 0, 8, 5, 'Europe/Dublin') //=> Date.parse('2026-12-02T00:08:05Z')
 */
export function atClockTimeNear(atMs: number, hour: number, minute: number, second: number, timeZone: string): number {
  const cur = new Intl.DateTimeFormat('en-GB', { timeZone, hour: '2-digit', minute: '2-digit', second: '2-digit', hourCycle: 'h23' }).format(new Date(atMs)).split(':').map(Number);
  let deltaS = (hour - cur[0]) * 3600 + (minute - cur[1]) * 60 + (second - cur[2]);
  if (deltaS > 43_200) deltaS -= 86_400;
  if (deltaS < -43_200) deltaS += 86_400;
  return atMs - (((atMs % 1000) + 1000) % 1000) + deltaS * 1000;
}
