import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeCase, compareValue, coverSeries, effectiveThreshold, intervalSetFromPairs, PLATEAU_DEFAULT_V1, resolveRule, termTruth, type Comparator } from '@/lib/rules';
import { MMHG_PER_KPA } from '@/lib/domain/channel';
import { caseOf, monitor, monitorAt, oneRule, propofolAt, runs } from './_build';

describe('conditions (rules.md §2)', () => {
  it('applies each comparator at, below and above its threshold', () => {
    const table: [Comparator, boolean, boolean, boolean][] = [
      ['<', true, false, false],
      ['<=', true, true, false],
      ['=', false, true, false],
      ['>=', false, true, true],
      ['>', false, false, true],
    ];
    for (const [cmp, below, at, above] of table) {
      expect([compareValue(7, cmp, 8), compareValue(8, cmp, 8), compareValue(9, cmp, 8)]).toEqual([below, at, above]);
      const tr = coverSeries(monitor('rr', [7, 8, 9]));
      const truth = termTruth(tr, cmp, 8);
      const expected = [below, at, above].flatMap((b, i) => (b ? [i, i + 1] : []));
      // touching seconds join into one interval
      const joined: number[] = [];
      for (let i = 0; i < expected.length; i += 2) {
        if (joined.length > 0 && joined[joined.length - 1] === expected[i]) joined[joined.length - 1] = expected[i + 1];
        else joined.push(expected[i], expected[i + 1]);
      }
      expect(truth).toEqual(joined);
    }
  });

  it('compares strictly at a fractional threshold without rounding the sample', () => {
    const tr = coverSeries(monitor('etco2', [49.999999, 50, 50.000001]));
    expect(termTruth(tr, '<', 50)).toEqual([0, 1]);
    expect(termTruth(tr, '>', 50)).toEqual([2, 3]);
  });

  it('ORs channels sampled at different times: EtCO2 every 1 s, RR every 5 s', () => {
    const rs = oneRule({
      id: 'apnea',
      terms: [
        { channel: 'etco2', comparator: '<', threshold: 5 },
        { channel: 'rr', comparator: '=', threshold: 0 },
      ],
      combine: 'any',
      minDurationS: 0,
    });
    const et = monitor('etco2', runs([38, 100], [0, 12], [38, 88])); // low 100–112
    const rrT = Array.from({ length: 40 }, (_, i) => i * 5);
    const rr = monitorAt('rr', rrT, rrT.map((t) => (t >= 110 && t < 125 ? 0 : 14))); // zero 110–125
    const a = analyzeCase(caseOf([et, rr]), rs);
    expect(a.episodes.map((e) => [e.start, e.end])).toEqual([[100, 125]]);
  });

  it('ANDs channels sampled at different times to the overlap of both', () => {
    const rs = oneRule({
      id: 'both',
      terms: [
        { channel: 'etco2', comparator: '>=', threshold: 50 },
        { channel: 'rr', comparator: '<', threshold: 8 },
      ],
      combine: 'all',
      minDurationS: 0,
    });
    const et = monitor('etco2', runs([40, 100], [55, 40], [40, 60])); // high 100–140
    const rrT = Array.from({ length: 40 }, (_, i) => i * 5);
    const rr = monitorAt('rr', rrT, rrT.map((t) => (t >= 120 && t < 160 ? 6 : 14))); // slow 120–160
    const a = analyzeCase(caseOf([et, rr]), rs);
    expect(a.episodes.map((e) => [e.start, e.end, e.censored])).toEqual([[120, 140, false]]);
  });

  it('reads a baseline-relative absolute-delta term as baseline + threshold', () => {
    expect(effectiveThreshold({ channel: 'etco2', comparator: '>=', threshold: 10, relativeTo: 'baseline' }, { etco2: 38, spo2: 98, rr: 14 })).toBe(48);
    expect(effectiveThreshold({ channel: 'etco2', comparator: '<=', threshold: -10, relativeTo: 'baseline', relativeKind: 'absolute-delta' }, { etco2: 38, spo2: 98, rr: 14 })).toBe(28);
  });

  it('reads a relative-percent term as baseline × (1 + threshold/100), rounded so 38 × 1.1 is 41.8', () => {
    const term = { channel: 'etco2' as const, comparator: '>=' as const, threshold: 10, relativeTo: 'baseline' as const, relativeKind: 'percent' as const };
    expect(effectiveThreshold(term, { etco2: 38, spo2: 98, rr: 14 })).toBe(41.8);
    expect(effectiveThreshold({ ...term, threshold: -10, comparator: '<=' }, { etco2: 40, spo2: 98, rr: 14 })).toBe(36);
    const rs = oneRule({ id: 'rise', terms: [term], combine: 'any', minDurationS: 0 });
    const et = monitor('etco2', runs([38, 130], [41.8, 10], [41.7, 10]));
    const a = analyzeCase(caseOf([et], { doses: [propofolAt(125)] }), rs);
    expect(a.episodes.map((e) => [e.start, e.end])).toEqual([[130, 140]]);
  });

  it('drops a relative term without baseline from an OR rule and lists it as skipped', () => {
    const r = resolveRule(PLATEAU_DEFAULT_V1.rules.find((x) => x.id === 'hypoventilation')!, { etco2: null, spo2: 98, rr: 14 });
    expect(r.runs).toBe(true);
    expect(r.terms.map((x) => x.index)).toEqual([0]);
    expect(r.skipped).toEqual([{ rule: 'hypoventilation', reason: 'no EtCO2 baseline', dropped: 'term', term: 1 }]);
  });

  it('does not run an AND rule whose relative term has no baseline', () => {
    const r = resolveRule(PLATEAU_DEFAULT_V1.rules.find((x) => x.id === 'low_etco2')!, { etco2: null, spo2: 98, rr: 14 });
    expect(r.runs).toBe(false);
    expect(r.skipped).toEqual([{ rule: 'low_etco2', reason: 'no EtCO2 baseline', dropped: 'rule' }]);
  });

  it('does not run an OR rule when every term was relative and dropped', () => {
    const rs = oneRule({ id: 'rel', terms: [{ channel: 'spo2', comparator: '<=', threshold: -5, relativeTo: 'baseline' }], combine: 'any', minDurationS: 0 });
    const a = analyzeCase(caseOf([monitor('spo2', runs([85, 10]), { t0: 500 })], { doses: [propofolAt(100)] }), rs);
    expect(a.skipped).toEqual([{ rule: 'rel', reason: 'no SpO2 baseline', dropped: 'rule' }]);
    expect(a.episodes).toEqual([]);
  });

  it('converts kPa input to mmHg before comparing: 6.67 kPa is ≥ 50 mmHg, 6.66 kPa is not', () => {
    const rs = oneRule({ id: 'high', terms: [{ channel: 'etco2', comparator: '>=', threshold: 50 }], combine: 'any', minDurationS: 0 });
    const et = monitor('etco2', runs([5, 10], [6.67, 10], [6.66, 10], [5, 10]), { unit: 'kPa' });
    const a = analyzeCase(caseOf([et], { etco2Unit: 'kPa' }), rs);
    expect(a.episodes.map((e) => [e.start, e.end])).toEqual([[10, 20]]);
    expect(a.episodes[0].extremes).toEqual([{ channel: 'etco2', kind: 'highest', value: 6.67, unit: 'kPa', t: 10 }]);
    expect(6.67 * MMHG_PER_KPA).toBeGreaterThanOrEqual(50);
    expect(6.66 * MMHG_PER_KPA).toBeLessThan(50);
  });

  it('reports kPa input in mmHg when the case displays mmHg, and the baseline in the display unit', () => {
    const et = monitor('etco2', runs([5.0, 130], [7.0, 40]), { unit: 'kPa' });
    const mm = analyzeCase(caseOf([et], { doses: [propofolAt(125)], etco2Unit: 'mmHg' }), PLATEAU_DEFAULT_V1);
    expect(mm.baseline.etco2).toBeCloseTo(5 * MMHG_PER_KPA, 3);
    expect(mm.baseline.etco2Unit).toBe('mmHg');
    const hypo = mm.episodes.find((e) => e.rule === 'hypoventilation')!;
    expect(hypo.extremes[0]).toMatchObject({ unit: 'mmHg', value: 52.5043 });
    const kpa = analyzeCase(caseOf([et], { doses: [propofolAt(125)], etco2Unit: 'kPa' }), PLATEAU_DEFAULT_V1);
    expect(kpa.baseline.etco2).toBe(5);
    expect(kpa.summary.highestEtco2).toEqual({ value: 7, t: 130 });
  });
});

/** Reference coverage and truth, sample by sample, straight from rules.md §1–§2 (no blocks, no segments). */
function naiveTruth(t: number[], v: number[], off: boolean[], spo2: boolean, maxHold: number, pred: (x: number) => boolean): number[] {
  const n = t.length;
  const diffs = t.slice(1).map((x, i) => x - t[i]).sort((a, b) => a - b);
  const m = diffs.length;
  const median = m === 0 ? 0 : m % 2 === 1 ? diffs[m >> 1] : (diffs[m / 2 - 1] + diffs[m / 2]) / 2;
  const pairs: [number, number][] = [];
  for (let i = 0; i < n; i++) {
    if (spo2 && (v[i] === 0 || off[i])) continue;
    if (!pred(v[i])) continue;
    const end = i + 1 < n ? Math.min(t[i + 1], t[i] + maxHold) : t[i] + Math.min(median, maxHold);
    if (end > t[i]) pairs.push([t[i], end]);
  }
  return intervalSetFromPairs(pairs);
}

describe('block-skipping condition evaluation', () => {
  it('matches a sample-by-sample reference on long random series with gaps and probe-off', () => {
    const arb = fc.record({
      runs: fc.array(fc.tuple(fc.constantFrom(0, 70, 84, 85, 89, 90, 97), fc.integer({ min: 1, max: 80 }), fc.boolean()), { minLength: 1, maxLength: 12 }),
      gaps: fc.array(fc.integer({ min: 0, max: 500 }), { maxLength: 4 }),
      dt: fc.constantFrom(1, 2, 0.5, 7),
      maxHold: fc.constantFrom(30, 10, 3),
      threshold: fc.constantFrom(85, 90, 0, 97),
      comparator: fc.constantFrom<Comparator>('<', '<=', '=', '>=', '>'),
    });
    fc.assert(
      fc.property(arb, ({ runs: parts, gaps, dt, maxHold, threshold, comparator }) => {
        const v: number[] = [];
        const off: boolean[] = [];
        for (const [value, count, probeOff] of parts) for (let i = 0; i < count; i++) {
          v.push(value);
          off.push(probeOff && i % 3 === 0);
        }
        const t = v.map((_, i) => i * dt + gaps.filter((g) => g <= i).length * 45);
        const series = { channel: 'spo2' as const, unit: '%' as const, source: 'monitor' as const, t, v, probeOff: off };
        const tr = coverSeries(series, { maxHoldS: maxHold });
        expect(termTruth(tr, comparator, threshold)).toEqual(naiveTruth(t, v, off, true, maxHold, (x) => compareValue(x, comparator, threshold)));
        expect(tr.covered).toEqual(naiveTruth(t, v, off, true, maxHold, () => true));
        const rr = coverSeries({ ...series, channel: 'rr', unit: '/min', probeOff: undefined }, { maxHoldS: maxHold });
        expect(termTruth(rr, comparator, threshold)).toEqual(naiveTruth(t, v, off, false, maxHold, (x) => compareValue(x, comparator, threshold)));
      }),
      { numRuns: 300 },
    );
  });
});
