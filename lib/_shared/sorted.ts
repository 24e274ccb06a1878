/**
 * First index with t[i] ≥ x in an ascending array.
 * @example lowerBound([0, 1, 2, 3], 1.5) //=> 2
 */
export function lowerBound(t: ArrayLike<number>, x: number): number {
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid] < x) lo = mid + 1;
    else hi = mid;
  }
  return lo;
}

/**
 * Median of a small list (copied and sorted); the mean of the two middle values for even counts.
 * @example medianOf([3, 1, 2, 10]) //=> 2.5
 */
export function medianOf(xs: readonly number[]): number {
  const s = [...xs].sort((a, b) => a - b);
  const n = s.length;
  if (n === 0) return NaN;
  return n % 2 ? s[(n - 1) / 2] : (s[n / 2 - 1] + s[n / 2]) / 2;
}
