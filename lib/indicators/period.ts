/**
 * Reporting periods: calendar months, quarters and years, as inclusive YYYY-MM-DD bounds on a
 * case's scheduled date (the date in the unit's zone). Pure; "today" comes in as an argument.
 */
export const PERIOD_KINDS = ['month', 'quarter', 'year'] as const;
export type PeriodKind = (typeof PERIOD_KINDS)[number];

export interface Period {
  kind: PeriodKind;
  /** `2026-07` (month), `2026-Q3` (quarter), `2026` (year). */
  label: string;
  /** First day, YYYY-MM-DD. */
  start: string;
  /** Last day, YYYY-MM-DD (inclusive). */
  end: string;
}

const MONTHS = ['January', 'February', 'March', 'April', 'May', 'June', 'July', 'August', 'September', 'October', 'November', 'December'];
const SHORT = MONTHS.map((m) => m.slice(0, 3));

const pad = (n: number) => String(n).padStart(2, '0');

function daysIn(year: number, month: number): number {
  return new Date(Date.UTC(year, month, 0)).getUTCDate();
}

/** A period from its year and the index of its first month (0-based), for each kind. */
function make(kind: PeriodKind, year: number, firstMonth: number): Period {
  const months = kind === 'month' ? 1 : kind === 'quarter' ? 3 : 12;
  const lastMonth = firstMonth + months - 1;
  const label = kind === 'month' ? `${year}-${pad(firstMonth + 1)}` : kind === 'quarter' ? `${year}-Q${firstMonth / 3 + 1}` : String(year);
  return { kind, label, start: `${year}-${pad(firstMonth + 1)}-01`, end: `${year}-${pad(lastMonth + 1)}-${pad(daysIn(year, lastMonth + 1))}` };
}

/**
 * Reads a period label; null when it is not one.
 * @example parsePeriod('2026-Q3') //=> { kind: 'quarter', label: '2026-Q3', start: '2026-07-01', end: '2026-09-30' }
 */
export function parsePeriod(label: string): Period | null {
  let m = /^(\d{4})-(0[1-9]|1[0-2])$/.exec(label);
  if (m) return make('month', Number(m[1]), Number(m[2]) - 1);
  m = /^(\d{4})-Q([1-4])$/.exec(label);
  if (m) return make('quarter', Number(m[1]), (Number(m[2]) - 1) * 3);
  m = /^(\d{4})$/.exec(label);
  if (m) return make('year', Number(m[1]), 0);
  return null;
}

/**
 * The period of a kind that contains a date (YYYY-MM-DD).
 * @example periodContaining('quarter', '2026-12-01').label //=> '2026-Q4'
 */
export function periodContaining(kind: PeriodKind, date: string): Period {
  const year = Number(date.slice(0, 4));
  const month = Number(date.slice(5, 7)) - 1;
  return make(kind, year, kind === 'month' ? month : kind === 'quarter' ? month - (month % 3) : 0);
}

/**
 * The period `n` steps later (negative: earlier).
 * @example shiftPeriod(parsePeriod('2026-01')!, -1).label //=> '2025-12'
 */
export function shiftPeriod(p: Period, n: number): Period {
  const step = p.kind === 'month' ? 1 : p.kind === 'quarter' ? 3 : 12;
  const index = Number(p.start.slice(0, 4)) * 12 + Number(p.start.slice(5, 7)) - 1 + n * step;
  return make(p.kind, Math.floor(index / 12), ((index % 12) + 12) % 12);
}

/** The same period one year earlier (12 months, 4 quarters or 1 year back). */
export function yearEarlier(p: Period): Period {
  return shiftPeriod(p, p.kind === 'month' ? -12 : p.kind === 'quarter' ? -4 : -1);
}

/**
 * The last period of a kind that has ended before `today` (the usual one to report).
 * @example lastCompletePeriod('quarter', '2026-12-01').label //=> '2026-Q3'
 */
export function lastCompletePeriod(kind: PeriodKind, today: string): Period {
  return shiftPeriod(periodContaining(kind, today), -1);
}

/** `count` consecutive periods ending with `last`, oldest first. */
export function periodsEndingWith(last: Period, count: number): Period[] {
  return Array.from({ length: count }, (_, i) => shiftPeriod(last, i - count + 1));
}

/**
 * The whole periods of a kind that lie inside [from, to] (YYYY-MM-DD, inclusive), oldest first.
 * @example periodsBetween('month', '2026-01-15', '2026-04-30').map((p) => p.label) //=> ['2026-02', '2026-03', '2026-04']
 */
export function periodsBetween(kind: PeriodKind, from: string, to: string): Period[] {
  const out: Period[] = [];
  let p = periodContaining(kind, from);
  if (p.start < from) p = shiftPeriod(p, 1);
  while (p.end <= to) {
    out.push(p);
    p = shiftPeriod(p, 1);
  }
  return out;
}

/**
 * A period for people.
 * @example formatPeriod(parsePeriod('2026-Q3')!) //=> 'Q3 2026 (Jul–Sep)'
 */
export function formatPeriod(p: Period): string {
  const y = p.start.slice(0, 4);
  const m = Number(p.start.slice(5, 7)) - 1;
  if (p.kind === 'month') return `${MONTHS[m]} ${y}`;
  if (p.kind === 'quarter') return `Q${m / 3 + 1} ${y} (${SHORT[m]}–${SHORT[m + 2]})`;
  return y;
}

/** A short chart-axis label: `Jul 26`, `Q3 26`, `2026`. */
export function shortPeriod(p: Period): string {
  const y = p.start.slice(2, 4);
  const m = Number(p.start.slice(5, 7)) - 1;
  if (p.kind === 'month') return `${SHORT[m]} ${y}`;
  if (p.kind === 'quarter') return `Q${m / 3 + 1} ${y}`;
  return p.start.slice(0, 4);
}
