/**
 * Median of numbers in a scratch array, in linear time (quickselect); the array is reordered.
 * Even counts give the mean of the two middle values. Used for sampling intervals and baselines,
 * where sorting with a comparator would dominate the engine's run time.
 *
 * @example
 * medianInPlace(Float64Array.of(3, 1, 4, 1, 5, 9))
 * //=> 3.5
 */
export function medianInPlace(a: Float64Array): number {
  const n = a.length;
  if (n === 0) return NaN;
  const mid = n >> 1;
  const upper = quickselect(a, mid);
  if (n % 2 === 1) return upper;
  // after quickselect a[0..mid) ≤ a[mid]: the lower middle value is their maximum
  let lower = -Infinity;
  for (let i = 0; i < mid; i++) if (a[i] > lower) lower = a[i];
  return (lower + upper) / 2;
}

/** k-th smallest of `a` (0-based), partially reordering it so a[0..k) ≤ a[k] ≤ a(k..]. */
function quickselect(a: Float64Array, k: number): number {
  let left = 0;
  let right = a.length - 1;
  while (right > left) {
    const pivot = a[(left + right) >> 1];
    let i = left;
    let j = right;
    while (i <= j) {
      while (a[i] < pivot) i++;
      while (a[j] > pivot) j--;
      if (i <= j) {
        const tmp = a[i];
        a[i] = a[j];
        a[j] = tmp;
        i++;
        j--;
      }
    }
    if (k <= j) right = j;
    else if (k >= i) left = i;
    else break;
  }
  return a[k];
}
