import type { SampleSeries } from '@/lib/domain/caseRecord';
import type { Pause } from './segmentBreaths';
import type { Breath } from './types';

export interface BreathTrendOptions {
  /** During a pause, EtCO2 0 and RR 0 are reported every `pauseStepS`, from `pauseMinS` after the last breath. */
  pauseStepS?: number;
  pauseMinS?: number;
}

/**
 * The per-breath trends as CaseRecord monitor series: `etco2` and `inspco2` (mmHg) at each
 * breath's end of expiration, `rr` (/min, breath start to next start) at the same instant. A flat
 * pause reads like a monitor in apnea: EtCO2 0 and RR 0 every 5 s, so the rules find apnea.
 * Values are clamped to the channels' accepted ranges.
 *
 * @example
 * breathTrends(breaths, pauses).map((s) => s.channel) //=> ['etco2', 'inspco2', 'rr']
 */
export function breathTrends(breaths: Breath[], pauses: Pause[], options: BreathTrendOptions = {}): SampleSeries[] {
  const step = options.pauseStepS ?? 5;
  const pauseMin = options.pauseMinS ?? 10;
  type P = [t: number, v: number];
  const et: P[] = [];
  const ins: P[] = [];
  const rr: P[] = [];
  const clamp = (x: number, hi: number) => Math.round(Math.min(hi, Math.max(0, x)) * 10) / 10;
  for (const b of breaths) {
    et.push([b.expEndS, clamp(b.etco2, 150)]);
    if (b.inspMin !== null) ins.push([b.expEndS, clamp(b.inspMin, 150)]);
    if (b.rrPerMin !== null) rr.push([b.expEndS, clamp(b.rrPerMin, 80)]);
  }
  for (const p of pauses) {
    for (let t = p.startS + pauseMin; t < p.endS; t += step) {
      et.push([t, 0]);
      rr.push([t, 0]);
    }
  }
  const series = (channel: 'etco2' | 'inspco2' | 'rr', pts: P[]): SampleSeries => {
    pts.sort((x, y) => x[0] - y[0]);
    const t: number[] = [];
    const v: number[] = [];
    for (const [ti, vi] of pts) {
      const r = Math.round(ti * 1000) / 1000;
      if (t.length && r <= t[t.length - 1]) continue;
      t.push(r);
      v.push(vi);
    }
    return { channel, unit: channel === 'rr' ? '/min' : 'mmHg', source: 'monitor', t, v };
  };
  return [series('etco2', et), series('inspco2', ins), series('rr', rr)].filter((s) => s.t.length > 0);
}
