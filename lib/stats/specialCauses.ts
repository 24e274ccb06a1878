import type { ControlChartPoint } from './controlChart';

/** `outsideLimits`: above the UCL or below the LCL. `sameSideRun`: in a run of ≥ 8 points strictly on one side of the centre line. */
export type SpecialCauseRule = 'outsideLimits' | 'sameSideRun';

export interface SpecialCausesOptions {
  /** Points in a row on one side of the centre that make a run; default 8. */
  runLength?: number;
}

export type SpecialCausePoint<P extends ControlChartPoint = ControlChartPoint> = P & { rules: SpecialCauseRule[] };

/**
 * Marks special-cause variation on a control chart, point by point: beyond the limits
 * (Shewhart, strictly outside) and runs of 8 or more consecutive points strictly on one
 * side of the centre line (Western Electric / Montgomery run rule). Every point of a
 * qualifying run is marked, not only the 8th; a point exactly on the centre line ends a
 * run. Points excluded from the centre line are checked like the others.
 *
 * @example
 * specialCauses(gChart([1, 2, 1, 3, 2, 1, 2, 1, 200])).map((p) => p.rules.join())
 * //=> ['sameSideRun', … (8 times), 'outsideLimits']
 */
export function specialCauses<P extends ControlChartPoint>(
  chart: { points: readonly P[] },
  options: SpecialCausesOptions = {},
): SpecialCausePoint<P>[] {
  const runLength = options.runLength ?? 8;
  if (!Number.isInteger(runLength) || runLength < 2) {
    throw new RangeError(`runLength must be a whole number ≥ 2 (got ${runLength})`);
  }
  const marked: SpecialCausePoint<P>[] = chart.points.map((p) => ({
    ...p,
    rules: p.value > p.ucl || p.value < p.lcl ? ['outsideLimits'] : [],
  }));
  let start = 0;
  const side = (p: P): number => Math.sign(p.value - p.centre);
  for (let i = 1; i <= chart.points.length; i++) {
    const s = side(chart.points[start]);
    if (i < chart.points.length && s !== 0 && side(chart.points[i]) === s) continue;
    if (s !== 0 && i - start >= runLength) {
      for (let j = start; j < i; j++) marked[j].rules.push('sameSideRun');
    }
    start = i;
  }
  return marked;
}
