import { gaussian, sfc32 } from './prng';
import type { WaveformSegment } from './types';

/**
 * The shape of the breaths in one stretch of a synthetic capnogram. Every breath is piecewise:
 *
 * ```
 *  etco2 ┤          ______/‾‾ ← phase III plateau (slope plateauSlope, optional notch)
 *        │         /          ↘ downstroke (downstrokeS, linear)
 *        │        / ← upstroke (linear ramp; 10–90 % takes riseTimeS)
 * insp.  ┤_______/             \______ inspired baseline (+ cardiogenic ripples)
 *            expStart ──── expiration (expFraction of the cycle) ──── expEnd
 * ```
 */
export interface BreathShape {
  /** Breaths per minute. */
  rrPerMin: number;
  /** Value at the end of the plateau (mmHg). */
  etco2: number;
  /** Inspired baseline (mmHg): 0 normally, above 0 when rebreathing. */
  inspired: number;
  /** Fraction of the cycle from the upstroke foot to the end of the plateau. */
  expFraction: number;
  /** Upstroke 10–90 % rise time (s); the linear ramp lasts riseTimeS / 0.8. */
  riseTimeS: number;
  /** Phase-III slope (mmHg/s); negative for a plateau that falls away (leak). */
  plateauSlope: number;
  /** Inspiratory downstroke duration (s). */
  downstrokeS: number;
  /** A dip in the plateau: depth (mmHg), centre as a fraction of the plateau, width (s). */
  notch: { depth: number; at: number; widthS: number } | null;
  /** A flat line at 0 mmHg (the waveform stops dead): no breaths in this stretch. */
  flat: boolean;
}

export interface GenerateCapnogramOptions {
  rateHz: number;
  /** Stretches played in turn; each breath takes the shape of the stretch it starts in. */
  stretches: Array<{ durationS: number } & Partial<BreathShape>>;
  /** White measurement noise, standard deviation (mmHg). */
  noiseSd?: number;
  /** Additive baseline drift: a sine of this amplitude (mmHg) and period (s). */
  drift?: { amp: number; periodS: number };
  /** Cardiogenic oscillations on the inspired baseline: ripples up to amp (mmHg) at the heart rate. */
  cardiogenic?: { amp: number; hrPerMin: number };
  /** Breath-to-breath variability: sd of the cycle length (fraction) and of etco2 (mmHg). */
  jitter?: { period: number; etco2: number };
  /** Time of the first sample (s from the case start). */
  t0S?: number;
  seed?: number;
}

/** The generator's ground truth for one breath. */
export interface TrueBreath {
  expStartS: number;
  expEndS: number;
  /** Noise-free value at the end of the plateau, drift included (mmHg). */
  etco2: number;
  /** Noise-free inspired baseline, drift included (mmHg). */
  inspired: number;
  rrPerMin: number;
  shape: BreathShape;
}

export const NORMAL_BREATH: BreathShape = {
  rrPerMin: 14,
  etco2: 38,
  inspired: 0,
  expFraction: 0.5,
  riseTimeS: 0.12,
  plateauSlope: 1.5,
  downstrokeS: 0.15,
  notch: null,
  flat: false,
};

/**
 * A seeded synthetic capnogram with its true breaths, for tests and the bench.
 *
 * @example
 * const { segment, truth } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 60 }], seed: 1 });
 * segment.v.length //=> 6000
 * truth.length     //=> 14 (14 /min for 60 s, the first breath at 1 s)
 */
export function generateCapnogram(opts: GenerateCapnogramOptions): { segment: WaveformSegment; truth: TrueBreath[] } {
  const rate = opts.rateHz;
  const rand = sfc32(opts.seed ?? 1);
  const totalS = opts.stretches.reduce((s, x) => s + x.durationS, 0);
  const n = Math.round(totalS * rate);
  const v = new Float32Array(n);
  const shapes = opts.stretches.map((s) => ({ ...NORMAL_BREATH, ...s }));
  const bounds: number[] = [];
  let acc = 0;
  for (const s of opts.stretches) bounds.push((acc += s.durationS));
  const shapeAt = (t: number): number => {
    for (let i = 0; i < bounds.length; i++) if (t < bounds[i]) return i;
    return bounds.length - 1;
  };
  const drift = (t: number) => (opts.drift ? opts.drift.amp * Math.sin((2 * Math.PI * t) / opts.drift.periodS) : 0);
  const cardio = opts.cardiogenic;
  const jitter = opts.jitter ?? { period: 0, etco2: 0 };

  // Baseline everywhere first: the inspired level of the stretch, drift and cardiogenic ripples.
  for (let k = 0; k < n; k++) {
    const t = k / rate;
    const sh = shapes[shapeAt(t)];
    let x = sh.flat ? 0 : sh.inspired + drift(t);
    if (cardio && !sh.flat) x += cardio.amp * (0.5 + 0.5 * Math.sin((2 * Math.PI * t * cardio.hrPerMin) / 60));
    v[k] = x;
  }

  const truth: TrueBreath[] = [];
  let tc = 1;
  while (tc < totalS) {
    const si = shapeAt(tc);
    const sh = shapes[si];
    if (sh.flat) {
      tc = bounds[si] + 0.5;
      continue;
    }
    const period = (60 / sh.rrPerMin) * (1 + jitter.period * gaussian(rand));
    const te = period * sh.expFraction;
    const endTidal = sh.etco2 + jitter.etco2 * gaussian(rand);
    const ramp = sh.riseTimeS / 0.8;
    const plateauDur = te - ramp;
    const p0 = endTidal - sh.plateauSlope * plateauDur;
    const end = tc + te + sh.downstrokeS;
    if (end + 0.5 > totalS) break;
    const k0 = Math.ceil(tc * rate);
    const k1 = Math.min(n, Math.ceil(end * rate));
    for (let k = k0; k < k1; k++) {
      const t = k / rate;
      const base = sh.inspired + drift(t);
      const u = t - tc;
      let x: number;
      if (u < ramp) x = sh.inspired + ((p0 - sh.inspired) * u) / ramp;
      else if (u < te) {
        x = p0 + sh.plateauSlope * (u - ramp);
        if (sh.notch) {
          const c = ramp + sh.notch.at * plateauDur;
          const d = Math.abs(u - c);
          if (d < sh.notch.widthS / 2) x -= (sh.notch.depth * (1 + Math.cos((2 * Math.PI * d) / sh.notch.widthS))) / 2;
        }
      } else x = endTidal + ((sh.inspired - endTidal) * (u - te)) / sh.downstrokeS;
      v[k] = x - sh.inspired + base;
    }
    truth.push({ expStartS: (opts.t0S ?? 0) + tc, expEndS: (opts.t0S ?? 0) + tc + te, etco2: endTidal + drift(tc + te), inspired: sh.inspired + drift(end), rrPerMin: 60 / period, shape: sh });
    tc += period;
  }
  const sd = opts.noiseSd ?? 0;
  if (sd > 0) for (let k = 0; k < n; k++) v[k] += sd * gaussian(rand);
  return { segment: { t0S: opts.t0S ?? 0, rateHz: rate, v }, truth };
}
