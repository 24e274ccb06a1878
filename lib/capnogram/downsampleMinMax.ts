/**
 * Min/max decimation for drawing: at most `maxPoints` points (pairs of the lowest and highest
 * value of each bucket, in time order) so a strip of an hour keeps its peaks. NaN stays NaN (a gap).
 *
 * @example
 * downsampleMinMax([0, 5, 1, 4, 2, 3], 0, 1, 4) //=> { t: [0, 1, 3, 4], v: [0, 5, 4, 2] }
 */
export function downsampleMinMax(v: ArrayLike<number>, t0S: number, rateHz: number, maxPoints: number): { t: number[]; v: (number | null)[] } {
  const n = v.length;
  const t: number[] = [];
  const out: (number | null)[] = [];
  const num = (x: number) => (x === x ? Math.round(x * 100) / 100 : null);
  if (n <= maxPoints) {
    for (let i = 0; i < n; i++) {
      t.push(t0S + i / rateHz);
      out.push(num(v[i]));
    }
    return { t, v: out };
  }
  const buckets = Math.max(1, Math.floor(maxPoints / 2));
  const size = n / buckets;
  for (let b = 0; b < buckets; b++) {
    const a = Math.floor(b * size);
    const e = Math.min(n, Math.floor((b + 1) * size));
    let lo = Infinity, hi = -Infinity, li = a, hiI = a, any = false;
    for (let i = a; i < e; i++) {
      const x = v[i];
      if (x !== x) continue;
      any = true;
      if (x < lo) { lo = x; li = i; }
      if (x > hi) { hi = x; hiI = i; }
    }
    if (!any) {
      t.push(t0S + a / rateHz);
      out.push(null);
      continue;
    }
    const [p, q] = li <= hiI ? [li, hiI] : [hiI, li];
    t.push(t0S + p / rateHz);
    out.push(num(v[p]));
    if (q !== p) {
      t.push(t0S + q / rateHz);
      out.push(num(v[q]));
    }
  }
  return { t, v: out };
}
