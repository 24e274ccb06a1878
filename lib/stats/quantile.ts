/**
 * Sample quantile by linear interpolation between order statistics: Hyndman & Fan 1996
 * type 7, R's default and Excel's PERCENTILE.INC. With values sorted x_1 ≤ … ≤ x_m,
 * h = (m − 1)p and the result is x_⌊h⌋+1 + (h − ⌊h⌋)(x_⌊h⌋+2 − x_⌊h⌋+1). Used for
 * response-time medians and 90th percentiles. The input is not changed. An empty list
 * gives NaN; a non-finite value or p outside [0, 1] throws RangeError.
 *
 * @example
 * quantile([12, 30, 45, 60, 240], 0.9)
 * //=> 168
 */
export function quantile(values: readonly number[], p: number): number {
  if (!(p >= 0 && p <= 1)) throw new RangeError(`p must lie in [0, 1] (got ${p})`);
  const sorted = Float64Array.from(values);
  sorted.forEach((v, i) => {
    if (!Number.isFinite(v)) throw new RangeError(`values[${i}] must be a finite number (got ${v})`);
  });
  if (sorted.length === 0) return Number.NaN;
  sorted.sort();
  const h = (sorted.length - 1) * p;
  const lo = Math.floor(h);
  const hi = Math.min(lo + 1, sorted.length - 1);
  return sorted[lo] + (h - lo) * (sorted[hi] - sorted[lo]);
}
