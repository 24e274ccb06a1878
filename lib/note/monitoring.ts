import type { CaseRecord, SampleSeries } from '@/lib/domain/caseRecord';
import { medianInterval } from '@/lib/rules/coverage';

/** A stretch without an observed monitor sample, in seconds from case start. */
export interface GapSpan {
  channel: 'etco2' | 'spo2';
  start: number;
  end: number;
}

/** Times of the observed samples of a monitor series (SpO2 0 and probe-off are unobserved, rules.md §1). */
export function observedTimes(series: SampleSeries): number[] {
  if (series.channel !== 'spo2') return series.t;
  const out: number[] = [];
  for (let i = 0; i < series.t.length; i++) {
    if (series.v[i] === 0 || series.probeOff?.[i] === true) continue;
    out.push(series.t[i]);
  }
  return out;
}

/**
 * Stretches of the sedation time `[from, to]` where the EtCO2 or SpO2 monitor series has no observed
 * sample for longer than `maxHoldS`: between two consecutive observed samples, from `from` to the
 * first one, or from the last one to `to`, each cut to the sedation time and listed when what is
 * left is longer than maxHold. A channel with a monitor series but no observed sample in the
 * sedation time is one gap over all of it; a channel without a monitor series is not listed here
 * (the note says it was not monitored). Sorted by start, then channel.
 *
 * @example
 * findDataGaps(record, 100, 1900, 30) // EtCO2 samples at …, 599, 664, … (65 s apart)
 * //=> [{ channel: 'etco2', start: 599, end: 664 }]
 */
export function findDataGaps(record: CaseRecord, from: number, to: number, maxHoldS: number): GapSpan[] {
  const gaps: GapSpan[] = [];
  for (const channel of ['etco2', 'spo2'] as const) {
    const series = record.series.find((s) => s.channel === channel && s.source === 'monitor');
    if (series === undefined) continue;
    const t = observedTimes(series);
    const edges = [-Infinity, ...t, Infinity];
    for (let i = 0; i + 1 < edges.length; i++) {
      const a = Math.max(edges[i], from);
      const b = Math.min(edges[i + 1], to);
      if (b - a > maxHoldS) gaps.push({ channel, start: a, end: b });
    }
  }
  return gaps.sort((x, y) => x.start - y.start || x.channel.localeCompare(y.channel));
}

/** Median sampling interval of a series, null for fewer than two samples. */
export function samplingInterval(series: SampleSeries): number | null {
  return series.t.length < 2 ? null : medianInterval(series.t);
}
