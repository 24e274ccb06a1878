import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyzeCase, coverCase, intervalClip, intervalTotal, intervalUnion, PLATEAU_DEFAULT_V1, type Analysis, type RuleSet } from '@/lib/rules';
import type { CaseRecord, SampleSeries } from '@/lib/domain/caseRecord';
import type { Channel } from '@/lib/domain/channel';
import { INTERVENTION_KINDS } from '@/lib/domain/intervention';
import { caseOf, manual, propofolAt } from './_build';

/** Values at and around every default threshold, so random traces cross them often. */
const VALUES = {
  etco2: [0, 3, 5, 20, 28, 30, 38, 45, 48, 50, 55],
  rr: [0, 4, 7, 8, 14],
  spo2: [0, 70, 74, 75, 84, 85, 89, 90, 97],
} as const;

type TraceChannel = keyof typeof VALUES;

const seriesArb = (channel: TraceChannel) =>
  fc
    .record({
      segs: fc.array(fc.tuple(fc.constantFrom(...VALUES[channel]), fc.integer({ min: 1, max: 40 })), { minLength: 1, maxLength: 10 }),
      dt: fc.constantFrom(1, 2, 5),
      t0: fc.integer({ min: 0, max: 10 }),
      gapAt: fc.option(fc.integer({ min: 1, max: 150 }), { nil: undefined }),
      gapS: fc.integer({ min: 10, max: 90 }),
    })
    .map(({ segs, dt, t0, gapAt, gapS }): SampleSeries => {
      const v = segs.flatMap(([value, n]) => Array.from({ length: n }, () => value as number));
      const t = v.map((_, i) => t0 + i * dt + (gapAt !== undefined && i >= gapAt ? gapS : 0));
      return { channel, unit: channel === 'etco2' ? 'mmHg' : channel === 'rr' ? '/min' : '%', source: 'monitor', t, v };
    });

const caseArb = fc
  .record({
    etco2: seriesArb('etco2'),
    rr: seriesArb('rr'),
    spo2: seriesArb('spo2'),
    doseT: fc.integer({ min: 0, max: 200 }),
    interventions: fc.array(fc.tuple(fc.integer({ min: 0, max: 400 }), fc.constantFrom(...INTERVENTION_KINDS)), { maxLength: 4 }),
    manualSpo2: fc.array(fc.constantFrom(...VALUES.spo2), { maxLength: 3 }),
  })
  .map(
    (r): CaseRecord =>
      caseOf([r.etco2, r.rr, r.spo2, ...(r.manualSpo2.length > 0 ? [manual('spo2', r.manualSpo2.map((_, i) => 37 + i * 60), [...r.manualSpo2])] : [])], {
        doses: [propofolAt(r.doseT)],
        interventions: r.interventions.map(([t, kind]) => ({ t, kind })),
      }),
  );

const channelsOf = (rs: RuleSet, ruleId: string): Channel[] => [...new Set(rs.rules.find((r) => r.id === ruleId)!.terms.map((t) => t.channel))];

/** Every time in a case moved by `c` seconds. */
function shifted(rec: CaseRecord, c: number): CaseRecord {
  return {
    ...rec,
    series: rec.series.map((s) => ({ ...s, t: s.t.map((t) => t + c) })),
    doses: rec.doses.map((d) => ({ ...d, t: d.t + c })),
    interventions: rec.interventions.map((x) => ({ ...x, t: x.t + c })),
    events: rec.events.map((x) => ({ ...x, t: x.t + c })),
  };
}

/** The time fields of an analysis moved back by `c`. */
function unshifted(a: Analysis, c: number) {
  return {
    episodes: a.episodes.map((e) => ({
      ...e,
      start: e.start - c,
      end: e.end - c,
      extremes: e.extremes.map((x) => ({ ...x, t: x.t - c })),
      lastSedativeDose: e.lastSedativeDose && { ...e.lastSedativeDose, t: e.lastSedativeDose.t - c },
      interventions: e.interventions.map((x) => ({ ...x, t: x.t - c })),
    })),
    spotFindings: a.spotFindings.map((f) => ({ ...f, t: f.t - c })),
    baseline: a.baseline,
    skipped: a.skipped,
    caseLevel: a.caseLevel,
    rules: a.summary.rules,
  };
}

/** Absolute single-channel rules; the neutral values satisfy none of them (nor the 25 mmHg abrupt-onset cut). */
const ABSOLUTE: RuleSet = {
  id: 'absolute',
  version: 1,
  description: 'absolute rules for the neutral-value property',
  rules: [
    { id: 'apnea', description: 'd', source: 's', terms: [{ channel: 'etco2', comparator: '<', threshold: 5 }], combine: 'any', minDurationS: 20 },
    { id: 'high', description: 'd', source: 's', terms: [{ channel: 'etco2', comparator: '>=', threshold: 50 }], combine: 'any', minDurationS: 30 },
    { id: 'slow', description: 'd', source: 's', terms: [{ channel: 'rr', comparator: '<', threshold: 8 }], combine: 'any', minDurationS: 30 },
    { id: 'low', description: 'd', source: 's', terms: [{ channel: 'spo2', comparator: '<', threshold: 90 }], combine: 'any', minDurationS: 15 },
  ],
};
const NEUTRAL: Record<TraceChannel, (x: number) => boolean> = {
  etco2: (x) => x >= 25 && x < 50,
  rr: (x) => x >= 8,
  spo2: (x) => x >= 90,
};
const NEUTRAL_VALUES: Record<TraceChannel, number[]> = { etco2: [30, 38, 45], rr: [8, 14, 20], spo2: [90, 97, 100] };

describe('properties of the engine (fast-check)', () => {
  it('never overlaps two episodes of one rule and keeps them sorted by start, then rule id', () => {
    fc.assert(
      fc.property(caseArb, (rec) => {
        const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
        for (let i = 1; i < a.episodes.length; i++) {
          const p = a.episodes[i - 1];
          const e = a.episodes[i];
          expect(p.start < e.start || (p.start === e.start && p.rule < e.rule)).toBe(true);
        }
        for (const rule of PLATEAU_DEFAULT_V1.rules) {
          const eps = a.episodes.filter((e) => e.rule === rule.id);
          for (let i = 1; i < eps.length; i++) expect(eps[i - 1].end).toBeLessThan(eps[i].start);
          for (const e of eps) expect(e.durationS).toBeGreaterThanOrEqual(rule.minDurationS);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('keeps the total duration of a rule within the time its channels were observed', () => {
    fc.assert(
      fc.property(caseArb, (rec) => {
        const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
        const traces = coverCase(rec);
        for (const rule of PLATEAU_DEFAULT_V1.rules) {
          const covered = channelsOf(PLATEAU_DEFAULT_V1, rule.id).reduce<number[]>((u, c) => intervalUnion(u, traces[c]?.covered ?? []), []);
          const eps = a.episodes.filter((e) => e.rule === rule.id);
          const total = eps.reduce((s, e) => s + e.durationS, 0);
          expect(total).toBeLessThanOrEqual(intervalTotal(covered) + 1e-9);
          for (const e of eps) expect(intervalTotal(intervalClip(covered, e.start, e.end))).toBeCloseTo(e.durationS, 9);
        }
      }),
      { numRuns: 200 },
    );
  });

  it('shifts every episode by a constant when every time in the case is shifted by it', () => {
    fc.assert(
      fc.property(caseArb, fc.integer({ min: -500, max: 5000 }), (rec, c) => {
        const a = analyzeCase(rec, PLATEAU_DEFAULT_V1);
        const b = analyzeCase(shifted(rec, c), PLATEAU_DEFAULT_V1);
        expect(unshifted(b, c)).toEqual(unshifted(a, 0));
      }),
      { numRuns: 150 },
    );
  });

  it('changes nothing when a sample moves between two values that satisfy no rule threshold', () => {
    fc.assert(
      fc.property(caseArb, fc.constantFrom<TraceChannel>('etco2', 'rr', 'spo2'), fc.nat(), fc.nat(), (rec, channel, pick, to) => {
        const k = rec.series.findIndex((s) => s.channel === channel && s.source === 'monitor');
        const s = rec.series[k];
        const neutral = s.v.flatMap((x, i) => (NEUTRAL[channel](x) ? [i] : []));
        fc.pre(neutral.length > 0);
        const i = neutral[pick % neutral.length];
        const v = s.v.slice();
        v[i] = NEUTRAL_VALUES[channel][to % 3];
        const changed = { ...rec, series: rec.series.map((x, j) => (j === k ? { ...x, v } : x)) };
        const a = analyzeCase(rec, ABSOLUTE);
        const b = analyzeCase(changed, ABSOLUTE);
        expect(b.episodes).toEqual(a.episodes);
        expect(b.spotFindings).toEqual(a.spotFindings);
        expect(b.summary.rules).toEqual(a.summary.rules);
      }),
      { numRuns: 200 },
    );
  });

  it('changes no plateau-default episode when an SpO2 sample moves between two values of 90 % or more', () => {
    fc.assert(
      fc.property(caseArb, fc.nat(), fc.nat(), (rec, pick, to) => {
        const k = rec.series.findIndex((s) => s.channel === 'spo2' && s.source === 'monitor');
        const neutral = rec.series[k].v.flatMap((x, i) => (x >= 90 ? [i] : []));
        fc.pre(neutral.length > 0);
        const v = rec.series[k].v.slice();
        v[neutral[pick % neutral.length]] = NEUTRAL_VALUES.spo2[to % 3];
        const changed = { ...rec, series: rec.series.map((x, j) => (j === k ? { ...x, v } : x)) };
        expect(analyzeCase(changed, PLATEAU_DEFAULT_V1).episodes).toEqual(analyzeCase(rec, PLATEAU_DEFAULT_V1).episodes);
      }),
      { numRuns: 150 },
    );
  });

  it('gives the same analysis whatever the order of the series', () => {
    fc.assert(
      fc.property(caseArb, fc.func(fc.integer()), (rec, key) => {
        const order = rec.series.map((s, i) => ({ s, k: key(i) })).sort((x, y) => x.k - y.k);
        const shuffled = { ...rec, series: order.map((x) => x.s) };
        expect(analyzeCase(shuffled, PLATEAU_DEFAULT_V1)).toEqual(analyzeCase(rec, PLATEAU_DEFAULT_V1));
      }),
      { numRuns: 150 },
    );
  });
});
