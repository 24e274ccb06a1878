import { CHANNEL_SPECS, type Channel } from '@/lib/domain/channel';
import type { Skipped } from '@/lib/domain/episode';
import type { BaselineChannel, Combine, Comparator, Rule, RuleTerm } from '@/lib/domain/ruleSet';
import type { EngineBaseline } from './baseline';
import { BLOCK_SHIFT, BLOCK_SIZE, type ChannelTrace, type TraceMap } from './coverage';
import { intervalIntersection, intervalUnion, type IntervalSet } from './intervalSet';

/**
 * True when `value comparator threshold` holds.
 *
 * @example
 * compareValue(89, '<', 90)
 * //=> true
 */
export function compareValue(value: number, comparator: Comparator, threshold: number): boolean {
  switch (comparator) {
    case '<':
      return value < threshold;
    case '<=':
      return value <= threshold;
    case '=':
      return value === threshold;
    case '>=':
      return value >= threshold;
    case '>':
      return value > threshold;
  }
}

/** Thresholds computed from a baseline are rounded to 1e-9 so 38 × 1.1 compares as 41.8. */
function roundThreshold(x: number): number {
  return Math.round(x * 1e9) / 1e9;
}

/**
 * The threshold a term compares with, in the channel's engine unit: the term's own for an
 * absolute term; baseline + threshold (`absolute-delta`) or baseline × (1 + threshold/100)
 * (`percent`) for a baseline-relative one; null when that baseline is null.
 *
 * @example
 * effectiveThreshold({ channel: 'etco2', comparator: '>=', threshold: 10, relativeTo: 'baseline' }, { etco2: 38, spo2: 98, rr: 14 })
 * //=> 48
 */
export function effectiveThreshold(term: RuleTerm, baseline: EngineBaseline): number | null {
  if (term.relativeTo === undefined) return term.threshold;
  const b = baseline[term.channel as BaselineChannel];
  if (b === null || b === undefined) return null;
  return roundThreshold(term.relativeKind === 'percent' ? b * (1 + term.threshold / 100) : b + term.threshold);
}

const view = new DataView(new ArrayBuffer(8));

/** The largest double below x (x finite or +Infinity). */
function nextDown(x: number): number {
  if (x === 0) return -Number.MIN_VALUE;
  view.setFloat64(0, x);
  let hi = view.getUint32(0);
  let lo = view.getUint32(4);
  if (x > 0) {
    if (lo === 0) {
      hi -= 1;
      lo = 0xffffffff;
    } else lo -= 1;
  } else if (lo === 0xffffffff) {
    hi += 1;
    lo = 0;
  } else lo += 1;
  view.setUint32(0, hi);
  view.setUint32(4, lo);
  return view.getFloat64(0);
}

/** A comparison as a closed range [lo, hi] of doubles, so one loop serves every comparator. */
function comparatorRange(comparator: Comparator, threshold: number): [number, number] {
  switch (comparator) {
    case '<':
      return [-Infinity, nextDown(threshold)];
    case '<=':
      return [-Infinity, threshold];
    case '=':
      return [threshold, threshold];
    case '>=':
      return [threshold, Infinity];
    case '>':
      return [-nextDown(-threshold), Infinity];
  }
}

/**
 * The covered time of a trace where `value comparator threshold` holds, as an interval set.
 * Walks each observed segment block by block: a whole block whose lowest and highest values lie
 * both outside (or both inside) the comparison is skipped without reading its samples; other
 * blocks are read sample by sample. No allocation per sample.
 *
 * @example
 * termTruth(coverSeries({ channel: 'spo2', unit: '%', source: 'monitor', t: [0, 1, 2, 3], v: [95, 88, 87, 96] }), '<', 90)
 * //=> [1, 3]
 */
export function termTruth(trace: ChannelTrace, comparator: Comparator, threshold: number): IntervalSet {
  const [lo, hi] = comparatorRange(comparator, threshold);
  const { t, v, segments, covered, blockMin, blockMax } = trace;
  const out: IntervalSet = [];
  for (let k = 0; k < segments.length; k += 2) {
    const end = segments[k + 1];
    let i = segments[k];
    let inRun = false;
    let runStart = 0;
    while (i < end) {
      const b = i >> BLOCK_SHIFT;
      const b0 = b << BLOCK_SHIFT;
      const b1 = b0 + BLOCK_SIZE;
      if (i === b0 && b1 <= end) {
        // a whole block inside the segment: decide it from its summary when possible
        const bmin = blockMin[b];
        const bmax = blockMax[b];
        if (bmax < lo || bmin > hi) {
          if (inRun) {
            out.push(t[runStart], t[i]);
            inRun = false;
          }
          i = b1;
          continue;
        }
        if (bmin >= lo && bmax <= hi) {
          if (!inRun) {
            runStart = i;
            inRun = true;
          }
          i = b1;
          continue;
        }
      }
      const stop = b1 < end ? b1 : end;
      for (; i < stop; i++) {
        const x = v[i];
        if (x >= lo && x <= hi) {
          if (!inRun) {
            runStart = i;
            inRun = true;
          }
        } else if (inRun) {
          // inside a segment a run ends where the next sample starts
          out.push(t[runStart], t[i]);
          inRun = false;
        }
      }
    }
    // a run reaching the segment's end ends where the segment's coverage does
    if (inRun) out.push(t[runStart], covered[k + 1]);
  }
  return out;
}

/** A term of a rule with its threshold resolved for one case. */
export interface ResolvedTerm {
  /** Index of the term in the rule. */
  index: number;
  channel: Channel;
  comparator: Comparator;
  /** Effective threshold in the engine unit. */
  threshold: number;
}

export interface ResolvedRule {
  rule: Rule;
  /** The terms that run (baseline-relative terms with a null baseline dropped). */
  terms: ResolvedTerm[];
  /** False when the rule is not evaluated at all (rules.md §3). */
  runs: boolean;
  skipped: Skipped[];
}

/**
 * Resolve a rule's thresholds against the case's baselines (rules.md §3): a relative term whose
 * baseline is null is dropped; in an `any` rule the others still run, in an `all` rule (or when no
 * term is left) the rule does not run. Every drop is listed in `skipped`.
 *
 * @example
 * resolveRule(lowEtco2Rule, { etco2: null, spo2: 98, rr: 14 }).skipped
 * //=> [{ rule: 'low_etco2', reason: 'no EtCO2 baseline', dropped: 'rule' }]
 */
export function resolveRule(rule: Rule, baseline: EngineBaseline): ResolvedRule {
  const terms: ResolvedTerm[] = [];
  const missing: { index: number; channel: Channel }[] = [];
  rule.terms.forEach((term, index) => {
    const threshold = effectiveThreshold(term, baseline);
    if (threshold === null) missing.push({ index, channel: term.channel });
    else terms.push({ index, channel: term.channel, comparator: term.comparator, threshold });
  });
  if (missing.length === 0) return { rule, terms, runs: true, skipped: [] };
  const reasonOf = (c: Channel) => `no ${CHANNEL_SPECS[c].label} baseline`;
  if (rule.combine === 'all' || terms.length === 0) {
    const reason = [...new Set(missing.map((m) => reasonOf(m.channel)))].join(', ');
    return { rule, terms: [], runs: false, skipped: [{ rule: rule.id, reason, dropped: 'rule' }] };
  }
  return {
    rule,
    terms,
    runs: true,
    skipped: missing.map((m) => ({ rule: rule.id, reason: reasonOf(m.channel), dropped: 'term' as const, term: m.index })),
  };
}

/** A term's true set beside its channel's observed time; what censoring needs (rules.md §2). */
export interface TermCondition {
  channel: Channel;
  truth: IntervalSet;
  covered: IntervalSet;
}

/** A rule's combined condition on one case. */
export interface RuleCondition {
  combine: Combine;
  terms: TermCondition[];
  /** Union (`any`) or intersection (`all`) of the terms' true sets. */
  truth: IntervalSet;
}

/**
 * Memo of term and rule conditions for one case: each distinct (channel, comparator, threshold)
 * is computed once, and rules with the same terms (apnea, prolonged_apnea) share one condition.
 *
 * @example
 * const cache = new ConditionCache(coverCase(record));
 * cache.term('spo2', '<', 90) === cache.term('spo2', '<', 90)
 * //=> true
 */
export class ConditionCache {
  private readonly termSets = new Map<string, IntervalSet>();
  private readonly ruleConditions = new Map<string, RuleCondition>();

  constructor(private readonly traces: TraceMap) {}

  /** True set of one term; empty when the channel has no monitor series. */
  term(channel: Channel, comparator: Comparator, threshold: number): IntervalSet {
    const key = `${channel}${comparator}${threshold}`;
    let set = this.termSets.get(key);
    if (set === undefined) {
      const trace = this.traces[channel];
      set = trace === undefined ? [] : termTruth(trace, comparator, threshold);
      this.termSets.set(key, set);
    }
    return set;
  }

  /** Combined condition of a resolved rule (call only for rules that run). */
  rule(resolved: ResolvedRule): RuleCondition {
    const combine = resolved.rule.combine;
    const key = combine + resolved.terms.map((x) => `|${x.channel}${x.comparator}${x.threshold}`).join('');
    let cond = this.ruleConditions.get(key);
    if (cond === undefined) {
      const terms = resolved.terms.map((x) => ({
        channel: x.channel,
        truth: this.term(x.channel, x.comparator, x.threshold),
        covered: this.traces[x.channel]?.covered ?? [],
      }));
      let truth = terms[0].truth;
      for (let k = 1; k < terms.length; k++) {
        truth = combine === 'any' ? intervalUnion(truth, terms[k].truth) : intervalIntersection(truth, terms[k].truth);
      }
      cond = { combine, terms, truth };
      this.ruleConditions.set(key, cond);
    }
    return cond;
  }
}
