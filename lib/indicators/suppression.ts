/**
 * Small-cell suppression (statistical disclosure control) for published indicator cells.
 * A count of cases with an event, or of cases without it, between 1 and minCell − 1 could
 * point at a patient, so such a cell is shown as "< 5" and its rate and interval are withheld.
 * Zeros are shown (a true zero is the most important safety message), and denominators of
 * proportions are shown (they are activity counts, and the reader needs them). See
 * docs/indicators.md for the whole policy, including the complementary rules.
 */

/**
 * Why a cell's count is not published:
 * - `small_numerator`: 1 ≤ cases with the event < minCell;
 * - `small_complement`: 1 ≤ cases without the event < minCell (the count could be recovered
 *   from the published denominator);
 * - `small_denominator`: fewer than minCell cases in the denominator (any rate would give the
 *   counts away);
 * - `small_n`: a quantile over fewer than minCell values (n is itself a count of cases with an
 *   event).
 */
export type Suppression = 'small_numerator' | 'small_complement' | 'small_denominator' | 'small_n' | null;

/** The cell size used when none is configured: counts 1–4 are suppressed (common practice). */
export const DEFAULT_MIN_CELL = 5;

/**
 * Whether a proportion cell x/n is published.
 * @example suppressionOf(3, 120, 5) //=> 'small_numerator'
 * @example suppressionOf(118, 120, 5) //=> 'small_complement'
 * @example suppressionOf(0, 120, 5) //=> null
 */
export function suppressionOf(x: number, n: number, minCell: number): Suppression {
  if (n === 0) return null;
  if (n < minCell) return 'small_denominator';
  if (x > 0 && x < minCell) return 'small_numerator';
  if (n - x > 0 && n - x < minCell) return 'small_complement';
  return null;
}

/** The published numerator: the count, or a bound that does not give it away. */
export function numeratorDisplay(x: number, n: number, s: Suppression, minCell: number): string {
  if (s === 'small_numerator') return `< ${minCell}`;
  if (s === 'small_complement') return `> ${n - minCell}`;
  if (s === 'small_denominator') return '–';
  return String(x);
}

/** Words for a suppression reason, for legends and footnotes. */
export function suppressionText(s: Exclude<Suppression, null>, minCell: number, kind: 'proportion' | 'quantile' = 'proportion'): string {
  if (kind === 'quantile' && s === 'small_complement') return `fewer than ${minCell} cases of the group left out of n: n shown only as a bound`;
  return {
    small_numerator: `fewer than ${minCell} cases with the event: count, rate and interval withheld`,
    small_complement: `fewer than ${minCell} cases without the event: count, rate and interval withheld`,
    small_denominator: `fewer than ${minCell} cases in the denominator: count, rate and interval withheld`,
    small_n: `fewer than ${minCell} values: n and the statistic withheld`,
  }[s];
}
