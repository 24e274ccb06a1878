/**
 * Wall-clock time in an IANA zone, with the platform's Intl time-zone data only (Node ships
 * full ICU). No library, no fixed offset table: the zone's offset at an instant is read from
 * `Intl.DateTimeFormat#formatToParts`, so daylight-saving changes are handled by the platform.
 * Calendar dates are plain `YYYY-MM-DD` strings; calendar arithmetic is done on UTC midnights,
 * which has no daylight-saving steps.
 */

export interface WallTime {
  year: number;
  /** 1–12 */
  month: number;
  day: number;
  hour: number;
  minute: number;
  second?: number;
}

const formatters = new Map<string, Intl.DateTimeFormat>();

function formatter(timeZone: string): Intl.DateTimeFormat {
  let f = formatters.get(timeZone);
  if (!f) {
    f = new Intl.DateTimeFormat('en-US', {
      timeZone,
      hourCycle: 'h23',
      year: 'numeric',
      month: '2-digit',
      day: '2-digit',
      hour: '2-digit',
      minute: '2-digit',
      second: '2-digit',
    });
    formatters.set(timeZone, f);
  }
  return f;
}

/**
 * The wall time in `timeZone` at a UTC instant.
 * @example wallTimeAt(Date.parse('2026-07-01T07:30:00Z'), 'Europe/Dublin') //=> { year: 2026, month: 7, day: 1, hour: 8, minute: 30, second: 0 }
 */
export function wallTimeAt(instantMs: number, timeZone: string): Required<WallTime> {
  const parts = formatter(timeZone).formatToParts(new Date(instantMs));
  const get = (type: Intl.DateTimeFormatPartTypes): number => Number(parts.find((p) => p.type === type)?.value);
  return { year: get('year'), month: get('month'), day: get('day'), hour: get('hour') % 24, minute: get('minute'), second: get('second') };
}

/** Offset of the zone from UTC at an instant, in minutes (east positive). */
export function zoneOffsetMinutes(instantMs: number, timeZone: string): number {
  const w = wallTimeAt(instantMs, timeZone);
  const asUtc = Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second);
  return Math.round((asUtc - Math.floor(instantMs / 1000) * 1000) / 60000);
}

/**
 * The UTC instant of a wall time in a zone. Inside a daylight-saving gap or overlap (wall times
 * that do not exist or exist twice) the answer is one of the nearby instants, not specified;
 * working hours 08:00–17:00 never fall there in the zones we use (changes happen at night).
 * @example zonedWallTimeToUtc({ year: 2026, month: 1, day: 5, hour: 8, minute: 0 }, 'Europe/Dublin') //=> Date.parse('2026-01-05T08:00:00Z')
 */
export function zonedWallTimeToUtc(w: WallTime, timeZone: string): number {
  const naive = Date.UTC(w.year, w.month - 1, w.day, w.hour, w.minute, w.second ?? 0);
  const guess = naive - zoneOffsetMinutes(naive, timeZone) * 60000;
  // Second pass: the offset at the guessed instant may differ from the one at the naive instant
  // (the two straddle a daylight-saving change).
  return naive - zoneOffsetMinutes(guess, timeZone) * 60000;
}

/** `YYYY-MM-DD` of an instant in a zone. @example localDateOf(Date.parse('2026-03-02T23:30:00Z'), 'Asia/Tokyo') //=> '2026-03-03' */
export function localDateOf(instantMs: number, timeZone: string): string {
  const w = wallTimeAt(instantMs, timeZone);
  return formatDate(w.year, w.month, w.day);
}

export function formatDate(year: number, month: number, day: number): string {
  return `${String(year).padStart(4, '0')}-${String(month).padStart(2, '0')}-${String(day).padStart(2, '0')}`;
}

export function parseDate(date: string): { year: number; month: number; day: number } {
  const [year, month, day] = date.split('-').map(Number);
  return { year, month, day };
}

/** Calendar date plus n days. @example addDays('2026-02-27', 2) //=> '2026-03-01' */
export function addDays(date: string, n: number): string {
  const { year, month, day } = parseDate(date);
  const d = new Date(Date.UTC(year, month - 1, day + n));
  return formatDate(d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate());
}

/** Calendar date minus n months, the day clamped to the target month's length. @example subtractMonths('2026-08-31', 6) //=> '2026-02-28' */
export function subtractMonths(date: string, n: number): string {
  const { year, month, day } = parseDate(date);
  const idx = year * 12 + (month - 1) - n;
  const y = Math.floor(idx / 12);
  const m = (idx % 12) + 1;
  const last = new Date(Date.UTC(y, m, 0)).getUTCDate();
  return formatDate(y, m, Math.min(day, last));
}

/** ISO weekday of a calendar date: 1 = Monday … 7 = Sunday. @example isoWeekday('2026-03-02') //=> 1 */
export function isoWeekday(date: string): number {
  const { year, month, day } = parseDate(date);
  const wd = new Date(Date.UTC(year, month - 1, day)).getUTCDay();
  return wd === 0 ? 7 : wd;
}

/** Whole days from date a to date b (b − a). */
export function daysBetween(a: string, b: string): number {
  const pa = parseDate(a);
  const pb = parseDate(b);
  return Math.round((Date.UTC(pb.year, pb.month - 1, pb.day) - Date.UTC(pa.year, pa.month - 1, pa.day)) / 86400000);
}
