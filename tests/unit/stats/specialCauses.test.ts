import { describe, expect, it } from 'vitest';
import { gChart, pChart, specialCauses, type ControlChartPoint } from '@/lib/stats';

/** A constructed chart with a fixed centre 10 and limits 4–16. */
function chartOf(values: number[]): { points: ControlChartPoint[] } {
  return {
    points: values.map((value, i) => ({ label: `P${i + 1}`, value, centre: 10, lcl: 4, ucl: 16, excluded: false })),
  };
}
const rulesOf = (values: number[], runLength?: number) =>
  specialCauses(chartOf(values), runLength ? { runLength } : {}).map((p) => p.rules);

// Rules: Shewhart's point beyond the 3-sigma limits, and the run rule of 8 successive
// points on one side of the centre line (Western Electric 1956 Statistical Quality Control
// Handbook; Montgomery, Introduction to Statistical Quality Control, from memory).
describe('the review flags special-cause variation on a control chart', () => {
  it('a point above the UCL or below the LCL breaks outsideLimits; on a limit does not', () => {
    expect(rulesOf([10, 17, 3, 16, 4, 11])).toEqual([[], ['outsideLimits'], ['outsideLimits'], [], [], []]);
  });

  it('8 points in a row above the centre each break sameSideRun; 7 do not', () => {
    const eight = [9, 11, 12, 11, 13, 11, 12, 11, 14, 9];
    expect(rulesOf(eight)).toEqual([[], ...Array(8).fill(['sameSideRun']), []]);
    const seven = [9, 11, 12, 11, 13, 11, 12, 11, 9];
    expect(rulesOf(seven).every((r) => r.length === 0)).toBe(true);
  });

  it('a point exactly on the centre line ends a run', () => {
    const broken = [11, 11, 11, 11, 10, 11, 11, 11, 11];
    expect(rulesOf(broken).every((r) => r.length === 0)).toBe(true);
  });

  it('a long run below the centre is marked all along, and a point can break both rules', () => {
    const values = [8, 7, 9, 8, 3, 8, 7, 9, 8, 7];
    const rules = rulesOf(values);
    expect(rules[4]).toEqual(['outsideLimits', 'sameSideRun']);
    expect(rules.every((r) => r.includes('sameSideRun'))).toBe(true);
  });

  it('the run length can be changed (e.g. 6 for a stricter review)', () => {
    expect(rulesOf([11, 11, 11, 11, 11, 11, 9], 6)).toEqual([...Array(6).fill(['sameSideRun']), []]);
    expect(() => rulesOf([1], 1)).toThrow(/runLength/);
  });

  it('works on real charts and keeps their fields: the Montgomery p chart flags samples 15 and 23', () => {
    // Same constructed Montgomery samples as controlCharts.test.ts.
    const counts = [12, 15, 8, 10, 4, 7, 16, 9, 14, 10, 5, 6, 17, 12, 22, 8, 10, 5, 13, 11, 20, 18, 24, 15, 9, 12, 7, 13, 9, 6];
    const marked = specialCauses(pChart(counts.map((x, i) => ({ label: `S${i + 1}`, x, n: 50 }))));
    expect(marked.filter((p) => p.rules.length).map((p) => p.label)).toEqual(['S15', 'S23']);
    expect(marked[14]).toMatchObject({ x: 22, n: 50, rules: ['outsideLimits'] });
  });

  it('on a g chart, a run of short gaps below the mean is flagged as well as a long gap above the UCL', () => {
    const marked = specialCauses(gChart([1, 2, 1, 3, 2, 1, 2, 1, 200]));
    expect(marked.map((p) => p.rules)).toEqual([...Array(8).fill(['sameSideRun']), ['outsideLimits']]);
  });

  it('an empty chart has no special causes', () => {
    expect(specialCauses({ points: [] })).toEqual([]);
  });
});
