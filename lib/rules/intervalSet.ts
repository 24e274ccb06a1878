/**
 * Sets of half-open time intervals [start, end), stored flat for speed: `[s0, e0, s1, e1, …]`.
 *
 * Every function here takes and returns a set in normal form: sorted, each interval non-empty
 * (start < end), and separated from the next by a positive gap (touching intervals are joined).
 * Inputs are assumed to be in normal form; `intervalSetFromPairs` builds one from anything.
 */
export type IntervalSet = number[];

/**
 * Build a normal-form set from arbitrary [start, end) pairs (unsorted, overlapping, empty ones).
 *
 * @example
 * intervalSetFromPairs([[5, 8], [0, 2], [2, 3], [4, 4]])
 * //=> [0, 3, 5, 8]
 */
export function intervalSetFromPairs(pairs: ReadonlyArray<readonly [number, number]>): IntervalSet {
  const sorted = pairs.filter(([s, e]) => e > s).sort((a, b) => a[0] - b[0] || a[1] - b[1]);
  const out: IntervalSet = [];
  for (const [s, e] of sorted) {
    const n = out.length;
    if (n > 0 && s <= out[n - 1]) {
      if (e > out[n - 1]) out[n - 1] = e;
    } else {
      out.push(s, e);
    }
  }
  return out;
}

/**
 * The set as [start, end] pairs, for reading and printing.
 *
 * @example
 * intervalSetToPairs([0, 3, 5, 8])
 * //=> [[0, 3], [5, 8]]
 */
export function intervalSetToPairs(set: IntervalSet): [number, number][] {
  const out: [number, number][] = [];
  for (let i = 0; i < set.length; i += 2) out.push([set[i], set[i + 1]]);
  return out;
}

/**
 * Union (OR) of two sets.
 *
 * @example
 * intervalUnion([0, 2, 6, 8], [1, 3, 8, 9])
 * //=> [0, 3, 6, 9]
 */
export function intervalUnion(a: IntervalSet, b: IntervalSet): IntervalSet {
  if (a.length === 0) return b.slice();
  if (b.length === 0) return a.slice();
  const out: IntervalSet = [];
  let i = 0;
  let j = 0;
  while (i < a.length || j < b.length) {
    let s: number;
    let e: number;
    if (j >= b.length || (i < a.length && a[i] <= b[j])) {
      s = a[i];
      e = a[i + 1];
      i += 2;
    } else {
      s = b[j];
      e = b[j + 1];
      j += 2;
    }
    const n = out.length;
    if (n > 0 && s <= out[n - 1]) {
      if (e > out[n - 1]) out[n - 1] = e;
    } else {
      out.push(s, e);
    }
  }
  return out;
}

/**
 * Intersection (AND) of two sets.
 *
 * @example
 * intervalIntersection([0, 5, 7, 10], [3, 8])
 * //=> [3, 5, 7, 8]
 */
export function intervalIntersection(a: IntervalSet, b: IntervalSet): IntervalSet {
  const out: IntervalSet = [];
  let i = 0;
  let j = 0;
  while (i < a.length && j < b.length) {
    const s = a[i] > b[j] ? a[i] : b[j];
    const e = a[i + 1] < b[j + 1] ? a[i + 1] : b[j + 1];
    if (s < e) out.push(s, e);
    if (a[i + 1] < b[j + 1]) i += 2;
    else j += 2;
  }
  return out;
}

/**
 * Difference a \ b: the time in `a` that is not in `b`.
 *
 * @example
 * intervalDifference([0, 10], [2, 3, 5, 6])
 * //=> [0, 2, 3, 5, 6, 10]
 */
export function intervalDifference(a: IntervalSet, b: IntervalSet): IntervalSet {
  const out: IntervalSet = [];
  let j = 0;
  for (let i = 0; i < a.length; i += 2) {
    let s = a[i];
    const e = a[i + 1];
    while (j < b.length && b[j + 1] <= s) j += 2;
    let k = j;
    while (k < b.length && b[k] < e) {
      if (b[k] > s) out.push(s, b[k]);
      if (b[k + 1] > s) s = b[k + 1];
      if (s >= e) break;
      k += 2;
    }
    if (s < e) out.push(s, e);
  }
  return out;
}

/**
 * Keep the intervals lasting at least `minDurationS` (compared with ≥, with a 1e-9 s tolerance
 * for fractional sample times).
 *
 * @example
 * filterMinDuration([0, 19, 30, 50], 20)
 * //=> [30, 50]
 */
export function filterMinDuration(set: IntervalSet, minDurationS: number): IntervalSet {
  if (minDurationS <= 0) return set.slice();
  const min = minDurationS - DURATION_TOLERANCE_S;
  const out: IntervalSet = [];
  for (let i = 0; i < set.length; i += 2) {
    if (set[i + 1] - set[i] >= min) out.push(set[i], set[i + 1]);
  }
  return out;
}

/** Durations within this of a minimum count as equal to it (sample times may be fractional). */
export const DURATION_TOLERANCE_S = 1e-9;

/**
 * Join intervals separated by a gap shorter than `gapS` (0 = off).
 *
 * @example
 * mergeGaps([0, 10, 13, 20, 30, 40], 5)
 * //=> [0, 20, 30, 40]
 */
export function mergeGaps(set: IntervalSet, gapS: number): IntervalSet {
  if (gapS <= 0 || set.length === 0) return set.slice();
  const out: IntervalSet = [set[0], set[1]];
  for (let i = 2; i < set.length; i += 2) {
    const n = out.length;
    if (set[i] - out[n - 1] < gapS) out[n - 1] = set[i + 1];
    else out.push(set[i], set[i + 1]);
  }
  return out;
}

/**
 * Total length of the set in seconds.
 *
 * @example
 * intervalTotal([0, 3, 5, 8])
 * //=> 6
 */
export function intervalTotal(set: IntervalSet): number {
  let sum = 0;
  for (let i = 0; i < set.length; i += 2) sum += set[i + 1] - set[i];
  return sum;
}

/** Index (even) of the first interval whose end is greater than `x`, or `set.length`. */
function firstEndingAfter(set: IntervalSet, x: number): number {
  let lo = 0;
  let hi = set.length >> 1;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (set[2 * mid + 1] > x) hi = mid;
    else lo = mid + 1;
  }
  return 2 * lo;
}

/**
 * True when instant `x` lies in the set (x ∈ [s, e) for some interval).
 *
 * @example
 * intervalContains([0, 5], 5)
 * //=> false
 */
export function intervalContains(set: IntervalSet, x: number): boolean {
  const k = firstEndingAfter(set, x);
  return k < set.length && set[k] <= x;
}

/**
 * True when the set holds the instants just before `x` (its left limit: s < x ≤ e).
 *
 * @example
 * intervalContainsBefore([0, 5], 5)
 * //=> true
 */
export function intervalContainsBefore(set: IntervalSet, x: number): boolean {
  const k = firstEndingAfter(set, x);
  // the interval ending exactly at x, if any, is just before k
  if (k >= 2 && set[k - 1] === x) return set[k - 2] < x;
  return k < set.length && set[k] < x;
}

/**
 * The part of the set inside [start, end).
 *
 * @example
 * intervalClip([0, 10, 20, 30], 5, 25)
 * //=> [5, 10, 20, 25]
 */
export function intervalClip(set: IntervalSet, start: number, end: number): IntervalSet {
  const out: IntervalSet = [];
  for (let k = firstEndingAfter(set, start); k < set.length && set[k] < end; k += 2) {
    const s = set[k] > start ? set[k] : start;
    const e = set[k + 1] < end ? set[k + 1] : end;
    if (s < e) out.push(s, e);
  }
  return out;
}
