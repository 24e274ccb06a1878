/**
 * Numbers of the indicator reports for people: rates in their unit, intervals, differences.
 * Display strings use the typographic minus (U+2212) and an en dash between limits; machine
 * exports (CSV, JSON) carry the plain numbers beside them.
 */
import type { IndicatorUnit } from './catalogue';

/** Multiplier from a proportion to the unit (per 100, per 1,000, %); 1 for seconds. */
export function unitScale(unit: IndicatorUnit): number {
  return unit === 'per1000' ? 1000 : unit === 'seconds' ? 1 : 100;
}

/**
 * @example unitLabel('per1000') //=> 'per 1,000 cases'
 */
export function unitLabel(unit: IndicatorUnit): string {
  return { per100: 'per 100 cases', per1000: 'per 1,000 cases', percent: '%', seconds: 'seconds' }[unit];
}

/** The unit of a difference between two periods. @example differenceUnit('percent') //=> 'percentage points' */
export function differenceUnit(unit: IndicatorUnit): string {
  return { per100: 'per 100 cases', per1000: 'per 1,000 cases', percent: 'percentage points', seconds: 'seconds' }[unit];
}

/** Rounds away floating-point noise so stored reports compare and diff cleanly. */
export function roundTo(v: number, digits = 6): number {
  const f = 10 ** digits;
  const r = Math.round(v * f) / f;
  return Object.is(r, -0) ? 0 : r;
}

const MINUS = '\u2212';

/**
 * One decimal, whole seconds when they are whole; minus as U+2212.
 * @example formatNumber(12.345, 'per100') //=> '12.3'
 */
export function formatNumber(v: number, unit: IndicatorUnit, signed = false): string {
  const digits = unit === 'seconds' && Number.isInteger(v) ? 0 : 1;
  const s = Math.abs(v).toLocaleString('en-GB', { minimumFractionDigits: digits, maximumFractionDigits: digits });
  const zero = Number(Math.abs(v).toFixed(digits)) === 0;
  if (v < 0 && !zero) return MINUS + s;
  return signed && !zero ? `+${s}` : s;
}

/** @example formatInterval(8.1, 17.25, 'per100') //=> '8.1–17.3' (rounded) */
export function formatInterval(lower: number, upper: number, unit: IndicatorUnit): string {
  return `${formatNumber(lower, unit)}\u2013${formatNumber(upper, unit)}`;
}

/** @example formatDifference(2.1, -3, 7.2, 'per100') //=> '+2.1 (−3.0 to +7.2)' */
export function formatDifference(estimate: number, lower: number | null, upper: number | null, unit: IndicatorUnit): string {
  const e = formatNumber(estimate, unit, true);
  if (lower === null || upper === null) return e;
  return `${e} (${formatNumber(lower, unit, true)} to ${formatNumber(upper, unit, true)})`;
}

/** Whole numbers with thousands separators. @example formatCount(1234) //=> '1,234' */
export function formatCount(n: number): string {
  return n.toLocaleString('en-GB');
}
