import type { Breath, WaveformGap, WaveformSegment } from './types';

/** Tuning of the breath detector. Defaults are Plateau's choices (docs/capnogram.md). */
export interface SegmentBreathsOptions {
  /** Values below this or above `maxMmHg` are treated as missing (a gap). */
  minMmHg?: number;
  maxMmHg?: number;
  /** Window of the adaptive high/low levels (s). */
  levelWindowS?: number;
  /** Rising threshold and falling threshold as fractions of (high − low): the hysteresis. */
  upFraction?: number;
  downFraction?: number;
  /** An excursion must stay above the falling threshold at least this long (s). */
  minExpS?: number;
  /** Breath starts closer than this are one breath (s); 0.9 s ≈ 67 /min. */
  minBreathS?: number;
  /** Smallest amplitude a breath may have (mmHg), and as a fraction of recent breaths. */
  minAmplitude?: number;
  minRelAmplitude?: number;
  /** No breath for this long (s) within a stretch of signal is a pause. */
  pauseMinS?: number;
  /** Stretches of signal shorter than this (s) are not analysed. */
  minStretchS?: number;
}

export const SEGMENT_DEFAULTS: Required<SegmentBreathsOptions> = {
  minMmHg: -10,
  maxMmHg: 150,
  levelWindowS: 10,
  upFraction: 0.5,
  downFraction: 0.3,
  minExpS: 0.3,
  minBreathS: 0.9,
  minAmplitude: 2,
  minRelAmplitude: 0.15,
  pauseMinS: 10,
  minStretchS: 2,
};

/** No breath for at least `pauseMinS` inside a stretch of signal. */
export interface Pause {
  startS: number;
  endS: number;
  /** Highest smoothed CO2 during the pause (mmHg). */
  maxCo2: number;
  /** Index of the breath before the pause, −1 when the stretch starts with it. */
  prevBreath: number;
  stretch: number;
}

export interface Segmentation {
  breaths: Breath[];
  pauses: Pause[];
  gaps: WaveformGap[];
  analysedS: number;
}

/**
 * Finds the breaths of a raw capnogram. Each stretch of finite, plausible samples is analysed on
 * its own (gaps end it); a lightly smoothed signal is compared with adaptive levels (the highest
 * and lowest value of the last `levelWindowS`) with hysteresis: an expiration starts when the
 * signal rises above low + 50 % of the range and ends when it falls below low + 30 %. Excursions
 * shorter than `minExpS` or smaller than the amplitude floor are ignored, breaths starting within
 * `minBreathS` of the previous one are merged into it. Landmarks are then measured on the signal
 * around each excursion. Memory is proportional to the breaths (plus one breath of scratch).
 *
 * @example
 * const { segment } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 60 }] });
 * segmentBreaths([segment]).breaths.length //=> 14
 */
export function segmentBreaths(segments: WaveformSegment[], options: SegmentBreathsOptions = {}): Segmentation {
  const o = { ...SEGMENT_DEFAULTS, ...options };
  const out: Segmentation = { breaths: [], pauses: [], gaps: [], analysedS: 0 };
  let stretch = 0;
  for (const seg of segments) {
    if (!(seg.rateHz >= 20 && seg.rateHz <= 300)) throw new RangeError(`rateHz: must be 20–300 Hz, got ${seg.rateHz}`);
    const v = seg.v;
    const n = v.length;
    const rate = seg.rateHz;
    const lo = o.minMmHg;
    const hi = o.maxMmHg;
    let i = 0;
    while (i < n) {
      let a = i;
      while (a < n && !(v[a] >= lo && v[a] <= hi)) a++;
      let b = a;
      while (b < n && v[b] >= lo && v[b] <= hi) b++;
      if (a > i) addGap(out.gaps, seg.t0S + i / rate, seg.t0S + a / rate);
      if (b > a) {
        if ((b - a) / rate >= o.minStretchS) {
          analyseStretch(v, a, b, rate, seg.t0S, stretch++, o, out);
          out.analysedS += (b - a) / rate;
        } else addGap(out.gaps, seg.t0S + a / rate, seg.t0S + b / rate);
      }
      i = b;
    }
  }
  return out;
}

function addGap(gaps: WaveformGap[], startS: number, endS: number): void {
  const last = gaps[gaps.length - 1];
  if (last && Math.abs(last.endS - startS) < 1e-9) last.endS = endS;
  else gaps.push({ startS, endS });
}

/** Mean of v over [i − h, i + h] clipped to [a, b). */
function sm(v: ArrayLike<number>, i: number, h: number, a: number, b: number): number {
  const lo = Math.max(a, i - h);
  const hi = Math.min(b - 1, i + h);
  let s = 0;
  for (let k = lo; k <= hi; k++) s += v[k];
  return s / (hi - lo + 1);
}

/** Lowest running mean of width w over [from, to) (w clipped to the range). */
function minMean(v: ArrayLike<number>, from: number, to: number, w: number): number {
  const len = to - from;
  if (len <= 0) return NaN;
  const ww = Math.max(1, Math.min(w, len));
  let s = 0;
  for (let k = from; k < from + ww; k++) s += v[k];
  let best = s;
  for (let k = from + ww; k < to; k++) {
    s += v[k] - v[k - ww];
    if (s < best) best = s;
  }
  return best / ww;
}

let scratch = new Float64Array(1024);

function analyseStretch(v: ArrayLike<number>, a: number, b: number, rate: number, t0S: number, stretch: number, o: Required<SegmentBreathsOptions>, out: Segmentation): void {
  // --- 1. Excursions: trailing box smoothing (S samples), block-wise trailing max/min, hysteresis.
  const S = Math.max(1, Math.round(0.05 * rate));
  const shift = (S - 1) >> 1;
  const B = Math.max(1, Math.round(0.1 * rate));
  const nBlocks = Math.max(2, Math.round(o.levelWindowS / (B / rate)));
  // Monotonic deques over the last nBlocks block maxima / minima (ring buffers of capacity cap).
  const cap = nBlocks + 1;
  const qMaxV = new Float64Array(cap), qMaxI = new Int32Array(cap);
  const qMinV = new Float64Array(cap), qMinI = new Int32Array(cap);
  let maxH = 0, maxT = 0, minH = 0, minT = 0;
  let blockNo = 0;
  let curMax = -Infinity;
  let curMin = Infinity;
  let inBlock = 0;
  let winMax = -Infinity;
  let winMin = Infinity;
  const ups: number[] = [];
  const downs: number[] = [];
  const amps: number[] = [];
  let high = false;
  let upIdx = 0;
  let excMax = 0;
  let excLo = 0;
  let sum = 0;
  let floor = o.minAmplitude;
  const minExp = Math.round(o.minExpS * rate);
  const minBreath = Math.round(o.minBreathS * rate);
  for (let i = a; i < b; i++) {
    sum += v[i];
    const s = i - a >= S ? (sum -= v[i - S]) / S : sum / (i - a + 1);
    if (s > curMax) curMax = s;
    if (s < curMin) curMin = s;
    if (++inBlock === B) {
      while (maxT !== maxH && qMaxV[(maxT + cap - 1) % cap] <= curMax) maxT = (maxT + cap - 1) % cap;
      qMaxV[maxT] = curMax;
      qMaxI[maxT] = blockNo;
      maxT = (maxT + 1) % cap;
      while (minT !== minH && qMinV[(minT + cap - 1) % cap] >= curMin) minT = (minT + cap - 1) % cap;
      qMinV[minT] = curMin;
      qMinI[minT] = blockNo;
      minT = (minT + 1) % cap;
      if (qMaxI[maxH] <= blockNo - nBlocks) maxH = (maxH + 1) % cap;
      if (qMinI[minH] <= blockNo - nBlocks) minH = (minH + 1) % cap;
      winMax = qMaxV[maxH];
      winMin = qMinV[minH];
      blockNo++;
      curMax = -Infinity;
      curMin = Infinity;
      inBlock = 0;
    }
    const hi = Math.max(winMax, curMax);
    const lo = Math.min(winMin, curMin);
    const range = hi - lo;
    if (!high) {
      if (range >= floor && s > lo + o.upFraction * range) {
        high = true;
        upIdx = i - shift;
        excMax = s;
        excLo = lo;
      }
    } else {
      if (s > excMax) excMax = s;
      if (s < lo + o.downFraction * range) {
        high = false;
        const down = i - shift;
        if (down - upIdx >= minExp && excMax - excLo >= floor) {
          const last = ups.length - 1;
          if (last >= 0 && upIdx - ups[last] < minBreath) downs[last] = down;
          else {
            ups.push(upIdx);
            downs.push(down);
            amps.push(excMax - excLo);
            if (amps.length > 9) amps.shift();
            floor = Math.max(o.minAmplitude, o.minRelAmplitude * median(amps));
          }
        }
      }
    }
  }

  // --- 2. Landmarks of each excursion.
  const h = Math.max(1, Math.round(0.02 * rate));
  const q = Math.max(1, Math.round(0.05 * rate));
  const w = Math.max(1, Math.round(0.1 * rate));
  const first = out.breaths.length;
  let prevEnd = a;
  const ends: number[] = [];
  for (let x = 0; x < ups.length; x++) {
    const u = Math.max(a, Math.min(b - 1, ups[x]));
    const d = Math.max(u + 1, Math.min(b - 1, downs[x]));
    const baseFrom = Math.max(prevEnd, u - Math.round(3 * rate), a);
    const base = baseFrom < u ? minMean(v, baseFrom, u, w) : sm(v, u, h, a, b);
    // End of the plateau: walk back from the falling crossing while the signal keeps rising backwards.
    let peak = -Infinity;
    for (let k = u; k <= d; k++) {
      const y = v[k];
      if (y > peak) peak = y;
    }
    const amp0 = Math.max(peak - base, 1e-6);
    let k = d;
    while (k - q >= u && sm(v, k - q, h, a, b) - sm(v, k, h, a, b) > 0.05 * amp0) k -= q;
    let e = k;
    let eVal = -Infinity;
    for (let j = Math.max(u, k - q); j <= Math.min(d, k + q); j++) {
      const y = sm(v, j, h, a, b);
      if (y > eVal) {
        eVal = y;
        e = j;
      }
    }
    const etco2 = eVal;
    const A = Math.max(etco2 - base, 1e-6);
    // Foot (10 %) and 90 % of the upstroke, linearly interpolated between samples.
    const l10 = base + 0.1 * A;
    const l90 = base + 0.9 * A;
    // Walk back from the end of the plateau to the upstroke's midpoint, then on to its foot, so an
    // excursion that began early (ripples before the first breath) still finds the real upstroke.
    const l50 = base + 0.5 * A;
    let f = e;
    while (f - 1 > prevEnd && sm(v, f - 1, h, a, b) > l50) f--;
    while (f - 1 > prevEnd && sm(v, f - 1, h, a, b) > l10) f--;
    const t10 = cross(v, f - 1, l10, h, a, b);
    let g = f;
    while (g < e && sm(v, g, h, a, b) < l90) g++;
    const t90 = Math.max(t10 + 1 / rate / 2, cross(v, g - 1, l90, h, a, b));
    // Phase-III slope by least squares over the later 80 % of the plateau.
    const p0 = Math.round(g + 0.2 * (e - g));
    const p1 = e - Math.max(1, Math.round(0.03 * rate));
    let slope = 0;
    if (p1 - p0 >= 3) {
      let sx = 0, sy = 0, sxx = 0, sxy = 0;
      const m = p1 - p0 + 1;
      for (let j = p0; j <= p1; j++) {
        const tx = (j - p0) / rate;
        const y = v[j];
        sx += tx;
        sy += y;
        sxx += tx * tx;
        sxy += tx * y;
      }
      const den = m * sxx - sx * sx;
      if (den > 0) slope = (m * sxy - sx * sy) / den;
    }
    // Deepest dip in the plateau that recovers afterwards.
    let notch = 0;
    const n0 = g;
    const n1 = e - Math.max(1, Math.round(0.05 * rate));
    if (n1 - n0 >= 3) {
      const len = n1 - n0 + 1;
      if (scratch.length < 2 * len) scratch = new Float64Array(4 * len);
      for (let j = 0; j < len; j++) scratch[j] = sm(v, n0 + j, h, a, b);
      let rMax = -Infinity;
      for (let j = len - 1; j >= 0; j--) {
        if (scratch[j] > rMax) rMax = scratch[j];
        scratch[len + j] = rMax;
      }
      let lMax = -Infinity;
      for (let j = 0; j < len; j++) {
        if (scratch[j] > lMax) lMax = scratch[j];
        const dip = Math.min(lMax, scratch[len + j]) - scratch[j];
        if (dip > notch) notch = dip;
      }
    }
    const riseTimeS = (t90 - t10) / rate;
    // Phase II slope: the steepest 0.1 s of the upstroke (from its foot to 90 %).
    let upSlope = (0.8 * A) / riseTimeS;
    for (let j = Math.max(a, Math.floor(t10)); j + 2 * q < b && j <= g; j++) {
      const sl = ((sm(v, j + 2 * q, h, a, b) - sm(v, j, h, a, b)) * rate) / (2 * q);
      if (sl > upSlope) upSlope = sl;
    }
    out.breaths.push({
      expStartS: t0S + t10 / rate,
      expEndS: t0S + e / rate,
      etco2,
      peak: Math.max(etco2, maxMean(v, u, e + 1, Math.max(1, 2 * h + 1))),
      inspMin: null,
      baseline: base,
      expTimeS: (e - t10) / rate,
      inspTimeS: null,
      rrPerMin: null,
      riseTimeS,
      upSlope,
      plateauSlope: slope,
      alphaDeg: 180 - (Math.atan(upSlope / A) * 180) / Math.PI + (Math.atan(slope / A) * 180) / Math.PI,
      notchDepth: notch,
      stretch,
    });
    ends.push(e);
    prevEnd = e;
  }

  // --- 3. Inspiration of each breath, rate, pauses.
  const pauseMin = o.pauseMinS;
  let prevBreath = -1;
  let pauseFrom = a;
  // The downstroke after the last breath is not part of the flat line.
  const settle = Math.round(0.5 * rate);
  for (let x = first; x < out.breaths.length; x++) {
    const br = out.breaths[x];
    const next = out.breaths[x + 1];
    const e = ends[x - first];
    const startIdx = Math.round((br.expStartS - t0S) * rate);
    if ((startIdx - pauseFrom) / rate >= pauseMin) out.pauses.push({ startS: t0S + pauseFrom / rate, endS: br.expStartS, maxCo2: maxMean(v, Math.min(startIdx - 1, pauseFrom + settle), startIdx, w), prevBreath, stretch });
    if (next && next.stretch === stretch) {
      const ns = Math.round((next.expStartS - t0S) * rate);
      br.inspMin = minMean(v, e, Math.max(e + 1, ns), w);
      br.inspTimeS = next.expStartS - br.expEndS;
      br.rrPerMin = 60 / (next.expStartS - br.expStartS);
    } else if ((b - e) / rate >= 1) br.inspMin = minMean(v, e, Math.min(b, e + Math.round(3 * rate)), w);
    prevBreath = x;
    pauseFrom = e;
  }
  if ((b - pauseFrom) / rate >= pauseMin) out.pauses.push({ startS: t0S + pauseFrom / rate, endS: t0S + b / rate, maxCo2: maxMean(v, Math.min(b - 1, pauseFrom + settle), b, w), prevBreath, stretch });
}

/** Highest running mean of width w over [from, to). */
function maxMean(v: ArrayLike<number>, from: number, to: number, w: number): number {
  const len = to - from;
  if (len <= 0) return NaN;
  const ww = Math.max(1, Math.min(w, len));
  let s = 0;
  for (let k = from; k < from + ww; k++) s += v[k];
  let best = s;
  for (let k = from + ww; k < to; k++) {
    s += v[k] - v[k - ww];
    if (s > best) best = s;
  }
  return best / ww;
}

/** Fractional sample index where the smoothed signal crosses `level` between k and k + 1. */
function cross(v: ArrayLike<number>, k: number, level: number, h: number, a: number, b: number): number {
  if (k < a) return a;
  if (k + 1 >= b) return b - 1;
  const y0 = sm(v, k, h, a, b);
  const y1 = sm(v, k + 1, h, a, b);
  if (y1 === y0) return k;
  const f = (level - y0) / (y1 - y0);
  return k + Math.max(0, Math.min(1, f));
}

function median(xs: number[]): number {
  const s = [...xs].sort((p, q) => p - q);
  const m = s.length >> 1;
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}
