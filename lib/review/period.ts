/**
 * Calendar arithmetic on YYYY-MM and YYYY-MM-DD strings (the unit's local dates, as
 * `Case.scheduledDate` stores them). No clock, no time zone: today's date comes in.
 */

export interface ReviewPeriod {
  /** Inclusive YYYY-MM-DD bounds. */
  from: string;
  to: string;
  /** Set when the period is exactly one calendar month. */
  month: string | null;
}

function ymd(y: number, m: number, d: number): string {
  return `${String(y).padStart(4, '0')}-${String(m).padStart(2, '0')}-${String(d).padStart(2, '0')}`;
}

/** @example shiftMonth('2026-01', -2) //=> '2025-11' */
export function shiftMonth(month: string, by: number): string {
  const y = Number(month.slice(0, 4));
  const m = Number(month.slice(5, 7)) - 1 + by;
  const yy = y + Math.floor(m / 12);
  const mm = ((m % 12) + 12) % 12;
  return `${String(yy).padStart(4, '0')}-${String(mm + 1).padStart(2, '0')}`;
}

/** @example monthEnd('2028-02') //=> '2028-02-29' */
export function monthEnd(month: string): string {
  const y = Number(month.slice(0, 4));
  const m = Number(month.slice(5, 7));
  return ymd(y, m, new Date(Date.UTC(y, m, 0)).getUTCDate());
}

/** @example monthPeriod('2026-11') //=> { from: '2026-11-01', to: '2026-11-30', month: '2026-11' } */
export function monthPeriod(month: string): ReviewPeriod {
  return { from: `${month}-01`, to: monthEnd(month), month };
}

/** The month before the one `today` falls in: the last full month. @example lastFullMonth('2026-12-01') //=> '2026-11' */
export function lastFullMonth(today: string): string {
  return shiftMonth(today.slice(0, 7), -1);
}

/** @example addDays('2026-03-01', -1) //=> '2026-02-28' */
export function addDays(date: string, days: number): string {
  const t = Date.UTC(Number(date.slice(0, 4)), Number(date.slice(5, 7)) - 1, Number(date.slice(8, 10))) + days * 86_400_000;
  const d = new Date(t);
  return ymd(d.getUTCFullYear(), d.getUTCMonth() + 1, d.getUTCDate());
}

/** Calendar months touched by [from, to], in order. @example monthsBetween('2026-10-15', '2026-12-01') //=> ['2026-10', '2026-11', '2026-12'] */
export function monthsBetween(from: string, to: string): string[] {
  const out: string[] = [];
  for (let m = from.slice(0, 7); m <= to.slice(0, 7); m = shiftMonth(m, 1)) out.push(m);
  return out;
}

/**
 * The period a query asks for: a month, a date range, or by default the last full month
 * before `today`. Expects already-validated strings (lib/domain/review `ReviewPeriodQuery`).
 */
export function resolvePeriod(q: { month?: string; from?: string; to?: string }, today: string): ReviewPeriod {
  if (q.from && q.to) {
    const month = q.from.slice(0, 7) === q.to.slice(0, 7) && q.from === `${q.from.slice(0, 7)}-01` && q.to === monthEnd(q.from.slice(0, 7)) ? q.from.slice(0, 7) : null;
    return { from: q.from, to: q.to, month };
  }
  return monthPeriod(q.month ?? lastFullMonth(today));
}

/**
 * The reference period of a review: the `months` calendar months before the period's first
 * month (default 6). Used for standardised ratios and as the run-in of the trend charts.
 * @example referencePeriod({ from: '2026-11-01', to: '2026-11-30', month: '2026-11' }) //=> { from: '2026-05-01', to: '2026-10-31', month: null }
 */
export function referencePeriod(period: ReviewPeriod, months = 6): ReviewPeriod {
  const first = period.from.slice(0, 7);
  return { from: `${shiftMonth(first, -months)}-01`, to: addDays(period.from, -1), month: null };
}

/** A readable name of a period. @example periodLabel({ from: '2026-11-01', to: '2026-11-30', month: '2026-11' }) //=> 'November 2026' */
export function periodLabel(p: ReviewPeriod): string {
  const name = (m: string) => new Intl.DateTimeFormat('en-GB', { month: 'long', year: 'numeric', timeZone: 'UTC' }).format(new Date(`${m}-01T00:00:00Z`));
  return p.month ? name(p.month) : `${p.from} to ${p.to}`;
}

/**
 * The months a review's trend charts show: the `count` months ending with the period's last
 * month (default 12, so that a run of 8 can show), or the period's own months when it is longer.
 * @example trendMonths(monthPeriod('2026-11'), 3) //=> ['2026-09', '2026-10', '2026-11']
 */
export function trendMonths(period: ReviewPeriod, count = 12): string[] {
  const own = monthsBetween(period.from, period.to);
  if (own.length >= count) return own;
  const last = period.to.slice(0, 7);
  return monthsBetween(`${shiftMonth(last, -(count - 1))}-01`, period.to);
}
