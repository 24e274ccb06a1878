import type { Channel } from '@/lib/domain/channel';
import type { DemoCase } from '@/lib/demo';

/** Maximal runs of consecutive 1 Hz samples where `pred` holds: [startT, durationS]. A gap in time breaks a run. */
export function runs(t: readonly number[], v: readonly number[], pred: (x: number) => boolean): [number, number][] {
  const out: [number, number][] = [];
  let s = -1;
  for (let i = 0; i < v.length; i++) {
    const ok = pred(v[i]);
    const contiguous = i > 0 && t[i] - t[i - 1] === 1;
    if (s >= 0 && (!ok || !contiguous)) {
      out.push([t[s], t[i - 1] - t[s] + 1]);
      s = -1;
    }
    if (ok && s < 0) s = i;
  }
  if (s >= 0) out.push([t[s], t[v.length - 1] - t[s] + 1]);
  return out;
}

export function longestRun(t: readonly number[], v: readonly number[], pred: (x: number) => boolean): number {
  return Math.max(0, ...runs(t, v, pred).map(([, d]) => d));
}

export function channel(c: DemoCase, ch: Channel) {
  const s = c.record.series.find((x) => x.channel === ch);
  if (!s) throw new Error(`${c.key}: no ${ch} series`);
  return s;
}

/** Per-case facts measured from the series the way a reviewer would (SpO2 0 = probe off, unobserved). */
export function measure(c: DemoCase) {
  const e = channel(c, 'etco2');
  const r = channel(c, 'rr');
  const o = channel(c, 'spo2');
  const observedSpo2 = o.v.filter((x, i) => x > 0 && !o.probeOff?.[i]);
  return {
    apneaS: longestRun(e.t, e.v, (x) => x < 5),
    hypoventilationS: longestRun(e.t, e.v, (x) => x >= 50),
    bradypneaS: longestRun(r.t, r.v, (x) => x > 0 && x < 8),
    below90S: longestRun(o.t, o.v, (x) => x > 0 && x < 90),
    minSpo2: Math.min(...observedSpo2),
  };
}

export const share = <T>(xs: readonly T[], pred: (x: T) => boolean) => xs.filter(pred).length / xs.length;
