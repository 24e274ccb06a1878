import { CHANNEL_SPECS, MMHG_PER_KPA, type Channel, type SampleUnit } from '@/lib/domain/channel';
import type { CaseRecord, SampleSeries } from '@/lib/domain/caseRecord';
import type { IntervalSet } from './intervalSet';
import { medianInPlace } from './median';

/** Default longest time one monitor sample is held as valid (rules.md §1). */
export const DEFAULT_MAX_HOLD_S = 30;

export interface CoverageOptions {
  /** Longest time a monitor sample covers; default 30 s. */
  maxHoldS?: number;
}

/**
 * One monitor series made ready for the engine: values in the engine unit and its observed time
 * as contiguous runs of samples. Built once per channel and shared by every condition on it.
 */
export interface ChannelTrace {
  channel: Channel;
  /** The series' sample times (not copied). */
  t: number[];
  /** Values in the engine unit (mmHg for CO2 channels); the series' own array unless converted. */
  v: number[];
  /** The series' own values, in `sourceUnit`. */
  raw: number[];
  /** The unit the values arrived in and the factor that took them to the engine unit. */
  sourceUnit: SampleUnit;
  factor: number;
  /** SpO2 probe-off flags, when the series has them. */
  probeOff: boolean[] | undefined;
  maxHoldS: number;
  /** Coverage of the last sample: min(median sampling interval, maxHold). */
  lastHoldS: number;
  /**
   * Observed runs of samples as index pairs [i0, i1): within a run each sample's coverage ends
   * where the next sample starts. For even k, run [segments[k], segments[k + 1]) covers the time
   * [covered[k], covered[k + 1]).
   */
  segments: number[];
  /** The observed time of the channel, as an interval set (one interval per segment). */
  covered: IntervalSet;
  /** Lowest / highest observed value per block of BLOCK_SIZE samples (±Infinity when none). */
  blockMin: number[];
  blockMax: number[];
  /** Index of the lowest / highest observed sample, −1 when none is observed. */
  minIndex: number;
  maxIndex: number;
}

/**
 * True when sample i counts as observed: not an SpO2 of 0 or marked probe-off (rules.md §1).
 *
 * @example
 * isObserved(coverSeries({ channel: 'spo2', unit: '%', source: 'monitor', t: [0, 1], v: [0, 97] }), 0)
 * //=> false
 */
export function isObserved(trace: ChannelTrace, i: number): boolean {
  if (trace.channel !== 'spo2') return true;
  return trace.v[i] !== 0 && trace.probeOff?.[i] !== true;
}

/**
 * End of the time sample i covers: the next sample's time when that is within maxHold, else
 * t_i + maxHold; the last sample t_i + lastHold. Equals t_i for an unobserved sample.
 *
 * @example
 * coverEndAt(coverSeries({ channel: 'rr', unit: '/min', source: 'monitor', t: [0, 1, 50], v: [12, 12, 12] }), 1)
 * //=> 31
 */
export function coverEndAt(trace: ChannelTrace, i: number): number {
  const t = trace.t;
  if (!isObserved(trace, i)) return t[i];
  if (i + 1 < t.length) {
    const next = t[i + 1];
    return next - t[i] <= trace.maxHoldS ? next : t[i] + trace.maxHoldS;
  }
  return t[i] + trace.lastHoldS;
}

/**
 * Median of the intervals between consecutive times (0 for fewer than two samples).
 *
 * @example
 * medianInterval([0, 1, 2, 4, 5])
 * //=> 1
 */
export function medianInterval(t: ArrayLike<number>): number {
  const n = t.length - 1;
  if (n < 1) return 0;
  const d = new Float64Array(n);
  for (let i = 0; i < n; i++) d[i] = t[i + 1] - t[i];
  return medianInPlace(d);
}

/** True when every interval between consecutive times equals `d0`. Kept small so it optimises well. */
function evenlySpaced(t: number[], d0: number): boolean {
  const n = t.length;
  let prev = t[0];
  for (let i = 1; i < n; i++) {
    const x = t[i];
    if (x - prev !== d0) return false;
    prev = x;
  }
  return true;
}

/** Samples per block of the per-block value summary (a power of two). */
export const BLOCK_SHIFT = 5;
export const BLOCK_SIZE = 1 << BLOCK_SHIFT;

/**
 * Coverage of one monitor series (rules.md §1): sample i covers
 * [t_i, t_i + min(t_{i+1} − t_i, maxHold)), the last sample min(median interval, maxHold).
 * An SpO2 sample marked probe-off or equal to 0 is unobserved. Assumes a validated series
 * (strictly increasing times, values in range) of source `monitor`.
 *
 * Cost: one pass over the times and one over the values (which also keeps, per block of 32
 * samples, the lowest and highest observed value, so a condition can skip whole blocks); an
 * unevenly sampled series takes two more passes over its times (median interval, gaps).
 *
 * @example
 * coverSeries({ channel: 'rr', unit: '/min', source: 'monitor', t: [0, 1, 50], v: [12, 12, 12] }).covered
 * //=> [0, 31, 50, 51]
 */
export function coverSeries(series: SampleSeries, options?: CoverageOptions): ChannelTrace {
  const maxHold = options?.maxHoldS ?? DEFAULT_MAX_HOLD_S;
  if (!(maxHold > 0)) throw new RangeError(`maxHoldS must be positive, got ${maxHold}`);
  const t = series.t;
  const n = t.length;
  const factor = series.unit === 'kPa' ? MMHG_PER_KPA : 1;
  const v = factor === 1 ? series.v : series.v.map((x) => x * factor);
  const probeOff = series.channel === 'spo2' ? series.probeOff : undefined;

  // times: a fast pass proves even sampling (the usual case); otherwise find the median
  // interval and the gaps longer than maxHold
  const d0 = n >= 2 ? t[1] - t[0] : 0;
  const gapsAfter: number[] = [];
  let median = d0;
  if (!evenlySpaced(t, d0)) {
    median = medianInterval(t);
    for (let i = 0; i + 1 < n; i++) if (t[i + 1] - t[i] > maxHold) gapsAfter.push(i);
  } else if (d0 > maxHold) {
    for (let i = 0; i + 1 < n; i++) gapsAfter.push(i);
  }
  const lastHoldS = n < 2 ? 0 : Math.min(median, maxHold);

  // values: per-block lowest / highest observed value (ternaries, not branches: noisy data
  // would mispredict them); unobserved SpO2 samples by index
  const blockMin: number[] = [];
  const blockMax: number[] = [];
  const unobserved: number[] = [];
  const spo2 = series.channel === 'spo2';
  let minBlock = -1;
  let maxBlock = -1;
  for (let b0 = 0; b0 < n; b0 += BLOCK_SIZE) {
    const b1 = b0 + BLOCK_SIZE < n ? b0 + BLOCK_SIZE : n;
    let lo = Infinity;
    let hi = -Infinity;
    if (spo2) {
      for (let i = b0; i < b1; i++) {
        const x = v[i];
        if (x === 0 || (probeOff !== undefined && probeOff[i] === true)) {
          unobserved.push(i);
          continue;
        }
        lo = x < lo ? x : lo;
        hi = x > hi ? x : hi;
      }
    } else {
      for (let i = b0; i < b1; i++) {
        const x = v[i];
        lo = x < lo ? x : lo;
        hi = x > hi ? x : hi;
      }
    }
    const b = blockMin.length;
    blockMin.push(lo);
    blockMax.push(hi);
    if (lo !== Infinity && (minBlock < 0 || lo < blockMin[minBlock])) minBlock = b;
    if (hi !== -Infinity && (maxBlock < 0 || hi > blockMax[maxBlock])) maxBlock = b;
  }

  // segments: observed runs between gaps and unobserved samples (one run for clean data)
  const segments: number[] = [];
  const covered: IntervalSet = [];
  let segStart = 0;
  let g = 0;
  let u = 0;
  for (;;) {
    const gap = g < gapsAfter.length ? gapsAfter[g] : Infinity;
    const off = u < unobserved.length ? unobserved[u] : Infinity;
    if (off <= gap && off !== Infinity) {
      pushSegment(segments, covered, t, segStart, off, t[off]);
      segStart = off + 1;
      u++;
    } else if (gap !== Infinity) {
      pushSegment(segments, covered, t, segStart, gap + 1, t[gap] + maxHold);
      if (gap + 1 > segStart) segStart = gap + 1;
      g++;
    } else {
      if (n > 0) pushSegment(segments, covered, t, segStart, n, t[n - 1] + lastHoldS);
      break;
    }
  }

  const any = segments.length > 0;
  const minIndex = any && minBlock >= 0 ? firstObservedIndexOf(v, probeOff, spo2, minBlock << BLOCK_SHIFT, blockMin[minBlock]) : -1;
  const maxIndex = any && maxBlock >= 0 ? firstObservedIndexOf(v, probeOff, spo2, maxBlock << BLOCK_SHIFT, blockMax[maxBlock]) : -1;
  return {
    channel: series.channel,
    t,
    v,
    raw: series.v,
    sourceUnit: series.unit,
    factor,
    probeOff,
    maxHoldS: maxHold,
    lastHoldS,
    segments,
    covered,
    blockMin,
    blockMax,
    minIndex,
    maxIndex,
  };
}

/** Add segment [i0, i1) covering [t[i0], end) when it is not empty. (No closures in coverSeries: captured locals would slow its loops.) */
function pushSegment(segments: number[], covered: IntervalSet, t: number[], i0: number, i1: number, end: number): void {
  if (i1 > i0 && end > t[i0]) {
    segments.push(i0, i1);
    covered.push(t[i0], end);
  }
}

/** First observed index from `from` whose value is `target`, or −1. */
function firstObservedIndexOf(v: number[], probeOff: boolean[] | undefined, spo2: boolean, from: number, target: number): number {
  for (let i = from; i < v.length; i++) {
    if (v[i] === target && (!spo2 || (v[i] !== 0 && (probeOff === undefined || probeOff[i] !== true)))) return i;
  }
  return -1;
}

/** The monitor traces of a case by channel (a case holds at most one monitor series per channel). */
export type TraceMap = Partial<Record<Channel, ChannelTrace>>;

/**
 * Cover every monitor series of a case (or only those of `channels`); manual series are spot
 * readings and cover nothing.
 *
 * @example
 * Object.keys(coverCase(record)) // for a case with EtCO2, SpO2 and RR monitor series
 * //=> ['etco2', 'spo2', 'rr']
 */
export function coverCase(record: CaseRecord, options?: CoverageOptions, channels?: ReadonlySet<Channel>): TraceMap {
  const traces: TraceMap = {};
  for (const series of record.series) {
    if (series.source !== 'monitor' || traces[series.channel] !== undefined) continue;
    if (channels !== undefined && !channels.has(series.channel)) continue;
    traces[series.channel] = coverSeries(series, options);
  }
  return traces;
}

/**
 * The engine unit of a channel (the first unit its spec lists); thresholds are in it.
 *
 * @example
 * engineUnit('etco2')
 * //=> 'mmHg'
 */
export function engineUnit(channel: Channel): SampleUnit {
  return CHANNEL_SPECS[channel].units[0];
}
