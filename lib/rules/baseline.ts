import { lowerBound } from '@/lib/_shared/sorted';
import type { CaseRecord, DoseEntry } from '@/lib/domain/caseRecord';
import { isSedativeDrug } from '@/lib/domain/drug';
import type { BaselineChannel } from '@/lib/domain/ruleSet';
import { isObserved, type ChannelTrace, type TraceMap } from './coverage';
import { medianInPlace } from './median';

/** Baselines in engine units (EtCO2 in mmHg); `null` where no window held enough samples. */
export type EngineBaseline = Record<BaselineChannel, number | null>;

/** Length of each baseline window (rules.md §3). */
export const BASELINE_WINDOW_S = 120;
/** Fewest samples a baseline window must hold. */
export const BASELINE_MIN_SAMPLES = 3;

/**
 * Time of the first sedative or opioid dose (`isSedativeDrug`), or null. Doses need not be sorted.
 *
 * @example
 * firstSedativeDoseTime([{ t: 90, drug: 'ondansetron', … }, { t: 150, drug: 'fentanyl', … }])
 * //=> 150
 */
export function firstSedativeDoseTime(doses: readonly DoseEntry[]): number | null {
  let first: number | null = null;
  for (const d of doses) if (isSedativeDrug(d.drug, d.drugClass) && (first === null || d.t < first)) first = d.t;
  return first;
}

function firstDoseTime(doses: readonly DoseEntry[]): number | null {
  let first: number | null = null;
  for (const d of doses) if (first === null || d.t < first) first = d.t;
  return first;
}


/** Median of the observed values with from ≤ t < to, or null when fewer than 3 lie there. */
function windowMedian(trace: ChannelTrace, from: number, to: number): number | null {
  const i0 = lowerBound(trace.t, from);
  const i1 = lowerBound(trace.t, to);
  if (i1 - i0 < BASELINE_MIN_SAMPLES) return null;
  const w = new Float64Array(i1 - i0);
  let k = 0;
  for (let i = i0; i < i1; i++) if (isObserved(trace, i)) w[k++] = trace.v[i];
  return k < BASELINE_MIN_SAMPLES ? null : medianInPlace(w.subarray(0, k));
}

/**
 * Baseline of one channel (rules.md §3): the median of its observed monitor samples in the 120 s
 * before the first sedative dose; if fewer than 3 lie there, the median of the first 120 s of
 * monitoring before any dose (also needing 3 samples); otherwise null. Without any sedative dose
 * only the second window applies.
 *
 * @example
 * channelBaseline(trace, 150, 150) // 1 Hz EtCO2 at 38 mmHg from t = 0
 * //=> 38
 */
export function channelBaseline(trace: ChannelTrace | undefined, firstSedativeT: number | null, firstAnyDoseT: number | null): number | null {
  if (trace === undefined) return null;
  if (firstSedativeT !== null) {
    const m = windowMedian(trace, firstSedativeT - BASELINE_WINDOW_S, firstSedativeT);
    if (m !== null) return m;
  }
  if (trace.covered.length === 0) return null;
  const t0 = trace.covered[0];
  const to = Math.min(t0 + BASELINE_WINDOW_S, firstAnyDoseT ?? Infinity);
  return windowMedian(trace, t0, to);
}

/**
 * Baselines of EtCO2, SpO2 and RR for a case, in engine units.
 *
 * @example
 * computeBaseline(record, coverCase(record))
 * //=> { etco2: 38, spo2: 98, rr: 14 }
 */
export function computeBaseline(record: CaseRecord, traces: TraceMap): EngineBaseline {
  const sed = firstSedativeDoseTime(record.doses);
  const any = firstDoseTime(record.doses);
  return {
    etco2: channelBaseline(traces.etco2, sed, any),
    spo2: channelBaseline(traces.spo2, sed, any),
    rr: channelBaseline(traces.rr, sed, any),
  };
}
