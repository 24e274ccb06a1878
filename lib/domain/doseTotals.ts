/**
 * Bedside checks on doses and readings. Running totals per drug live in lib/note (drugTotals),
 * so the sheet and the signed note add doses the same way.
 */
/**
 * True when a single dose is far above the unit's usual (a per-unit setting): shown, never enforced.
 * @example doseCaution(150, { cautionAbove: 100 }) //=> true
 */
export function doseCaution(amount: number, drug: { cautionAbove?: number | null }): boolean {
  return drug.cautionAbove != null && amount > drug.cautionAbove;
}

/**
 * When the last manual BP/HR reading is older than the reminder interval during moderate or
 * deep sedation (common practice; ASA 2018 moderate-sedation guideline, 5-minute wording from
 * memory). Returns the seconds overdue, or null when no reminder is due.
 * @example vitalsOverdue({ nowS: 700, lastReadingS: 300, sedationStartS: 100, sedationEndS: null, depth: 'moderate', intervalMin: 5 }) //=> 100
 */
export function vitalsOverdue(p: { nowS: number; lastReadingS: number | null; sedationStartS: number | null; sedationEndS: number | null; depth: string; intervalMin: number }): number | null {
  if (p.sedationStartS === null || p.sedationEndS !== null) return null;
  if (p.depth !== 'moderate' && p.depth !== 'deep' && p.depth !== 'general') return null;
  const since = p.lastReadingS === null || p.lastReadingS < p.sedationStartS ? p.sedationStartS : p.lastReadingS;
  const overdue = p.nowS - since - p.intervalMin * 60;
  return overdue > 0 ? overdue : null;
}
