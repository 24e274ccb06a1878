/**
 * 1 Hz monitor series of a demo case: EtCO2 (mmHg), RR (/min, from the capnograph), SpO2 (%),
 * HR (/min). A smooth drug-effect curve moves the baseline (RR down, EtCO2 up, a little SpO2
 * and HR down), slow AR(1) wander and white noise make it look like a monitor, and the planned
 * events are laid over it. Values are whole numbers, as monitors export them. Invented model.
 */
import type { DoseEntry, SampleSeries } from '@/lib/domain/caseRecord';
import type { Rng } from './random';
import type { SignalEvent } from './respiratoryEvents';
import type { CaseTimeline } from './sedationPlan';

export interface Baselines {
  etco2: number;
  rr: number;
  /** SpO2 on room air. */
  spo2Air: number;
  /** SpO2 gain once nasal oxygen is on (from 30 s before the first dose). */
  spo2O2Gain: number;
  hr: number;
}

/** Draw a patient's baselines: EtCO2 33–42 mmHg, RR 10–20 /min, SpO2 95–100 %, HR 55–110 /min. */
export function drawBaselines(rng: Rng, o: { ageYears: number; bmi: number }): Baselines {
  const spo2Air = Math.min(100, Math.max(95, 98.4 - 0.035 * (o.ageYears - 50) - 0.12 * Math.max(0, o.bmi - 30) + rng.normal(0, 0.8)));
  return {
    etco2: rng.uniform(33, 42),
    rr: rng.uniform(10, 20),
    spo2Air,
    spo2O2Gain: rng.uniform(0.8, 2.5),
    hr: rng.normalClipped(76, 11, 55, 110),
  };
}

interface DrugKinetics {
  /** Onset and offset time constants, s (a Bateman curve). */
  onsetS: number;
  offsetS: number;
  /** Peak respiratory effect per unit of dose per kg. */
  perUnitPerKg: number;
}

/** Effect model: 1 mg/kg propofol ≈ 1.0 at peak; opioid and benzodiazepine slower and longer. */
export const DRUG_KINETICS: Record<string, DrugKinetics> = {
  propofol: { onsetS: 25, offsetS: 240, perUnitPerKg: 1.0 },
  midazolam: { onsetS: 90, offsetS: 1500, perUnitPerKg: 12 },
  fentanyl: { onsetS: 120, offsetS: 1500, perUnitPerKg: 0.4 },
  ketamine: { onsetS: 40, offsetS: 600, perUnitPerKg: 0.15 },
};

/**
 * Drug effect per second for t = 0..n-1, summed over doses of the named drugs (all known
 * depressants when `drugs` is omitted). Recursive exponentials: O(doses × n) multiplications.
 */
export function drugEffect(doses: readonly DoseEntry[], weightKg: number, n: number, drugs?: readonly string[]): Float64Array {
  const out = new Float64Array(n);
  for (const d of doses) {
    const k = DRUG_KINETICS[d.drug];
    if (!k || (drugs && !drugs.includes(d.drug))) continue;
    const { onsetS: ta, offsetS: te } = k;
    const peakT = (Math.log(te / ta) * ta * te) / (te - ta);
    const peak = Math.exp(-peakT / te) - Math.exp(-peakT / ta);
    const amp = (k.perUnitPerKg * d.amount) / weightKg / peak;
    const t0 = Math.ceil(d.t);
    if (t0 >= n) continue;
    let ee = Math.exp(-(t0 - d.t) / te);
    let ea = Math.exp(-(t0 - d.t) / ta);
    const fe = Math.exp(-1 / te);
    const fa = Math.exp(-1 / ta);
    for (let t = t0; t < n; t++) {
      out[t] += amp * (ee - ea);
      ee *= fe;
      ea *= fa;
    }
  }
  return out;
}

/** Piecewise-linear interpolation through points sorted by time; flat outside. */
export function piecewiseLinear(points: readonly (readonly [number, number])[], t: number): number {
  if (t <= points[0][0]) return points[0][1];
  for (let i = 1; i < points.length; i++) {
    const [t1, v1] = points[i];
    if (t <= t1) {
      const [t0, v0] = points[i - 1];
      return t1 === t0 ? v1 : v0 + ((v1 - v0) * (t - t0)) / (t1 - t0);
    }
  }
  return points[points.length - 1][1];
}

/**
 * SpO2 curve of a desaturation: below 90 % (after rounding) on [start, end), nadir in between,
 * a fall of `leadS` before and a recovery of `tailS` after, back to `from`.
 */
export function desaturationCurve(e: SignalEvent, from: number, holdS: number): (readonly [number, number])[] {
  const b = e.end - e.start;
  const mid = e.start + b * 0.45;
  const hold = Math.min(holdS, b * 0.4);
  const nadir = e.value ?? 88;
  // 89.6 rounds to 90 and 89.4 to 89: the rounded curve crosses 90 exactly at start and end.
  return [
    [e.start - (e.leadS ?? 10), from],
    [e.start - 1, 89.6],
    [e.start, 89.4],
    [mid - hold / 2, nadir],
    [mid + hold / 2, nadir],
    [e.end - 1, 89.4],
    [e.end, 89.6],
    [e.end + (e.tailS ?? 20), from],
  ];
}

export interface SynthesizeOptions {
  /** Last sample time (the recovery start); samples at t = 0, 1, …, endS. */
  endS: number;
  doses: readonly DoseEntry[];
  weightKg: number;
  ageYears: number;
  timeline: CaseTimeline;
  events: readonly SignalEvent[];
  baselines: Baselines;
}

export interface SynthesizedSignals {
  series: SampleSeries[];
  /** Drug effect per second (all depressants), for manual BP and tests. */
  effect: Float64Array;
  /** Propofol-only effect per second. */
  propofolEffect: Float64Array;
  /** Monitor HR per second before rounding (manual HR readings are taken near it). */
  hr: Float64Array;
}

const clamp = (x: number, lo: number, hi: number) => (x < lo ? lo : x > hi ? hi : x);

export function synthesizeSignals(rng: Rng, o: SynthesizeOptions): SynthesizedSignals {
  const n = o.endS + 1;
  const B = o.baselines;
  const ageGain = o.ageYears >= 70 ? 1.25 : 1;
  const D = drugEffect(o.doses, o.weightKg, n);
  const Dp = drugEffect(o.doses, o.weightKg, n, ['propofol']);
  const Dk = drugEffect(o.doses, o.weightKg, n, ['ketamine']);
  const etco2 = new Float64Array(n);
  const rr = new Float64Array(n);
  const spo2 = new Float64Array(n);
  const hr = new Float64Array(n);
  const o2On = o.timeline.sedationStart - 30;
  const procStart = o.timeline.procedureStart;
  let wE = rng.normal(0, 1.2);
  let wR = rng.normal(0, 1);
  let wS = rng.normal(0, 0.4);
  let wH = rng.normal(0, 2);
  for (let t = 0; t < n; t++) {
    wE = 0.97 * wE + rng.normal(0, 0.35);
    wR = 0.95 * wR + rng.normal(0, 0.4);
    wS = 0.98 * wS + rng.normal(0, 0.12);
    wH = 0.97 * wH + rng.normal(0, 0.5);
    const d = Math.min(1.4, D[t] * ageGain);
    const stim = t >= procStart ? Math.exp(-(t - procStart) / 150) : 0;
    etco2[t] = clamp(B.etco2 + 5 * d + wE + rng.normal(0, 0.5), 26, 48.4);
    rr[t] = clamp(B.rr * (1 - 0.3 * Math.min(d, 1.2)) + 2 * stim + wR + rng.normal(0, 0.6), 8.6, 30);
    const o2 = t < o2On ? 0 : Math.min(1, (t - o2On) / 60) * B.spo2O2Gain;
    spo2[t] = clamp(B.spo2Air + o2 - 0.8 * Math.min(d, 1.2) + wS + rng.normal(0, 0.3), 93, 100);
    hr[t] = clamp(B.hr - 7 * Math.min(Dp[t], 1.2) + 9 * stim + 12 * Math.min(Dk[t], 1) + wH + rng.normal(0, 1), 40, 160);
  }

  const keep = new Uint8Array(n).fill(1);
  const probeOff = new Uint8Array(n);
  let anyProbeOff = false;
  const inRange = (t: number) => t >= 0 && t < n;

  for (const e of o.events) {
    switch (e.kind) {
      case 'apnea': {
        const lead = e.leadS ?? 10;
        const tail = e.tailS ?? 30;
        const v0 = etco2[Math.max(0, e.start - lead)];
        for (let t = e.start - lead; t < e.start; t++) if (inRange(t)) etco2[t] = v0 + (5.6 - v0) * ((t - (e.start - lead)) / lead);
        const hrRise = rng.uniform(3, 8);
        for (let t = e.start; t < e.end; t++) {
          if (!inRange(t)) continue;
          etco2[t] = rng.weighted([[0, 70], [1, 15], [2, 10], [3, 5]] as const);
          rr[t] = 0;
          hr[t] += hrRise * Math.min(1, (t - e.start) / 15);
        }
        const over = rng.uniform(4, 9);
        const rrOver = rng.uniform(3, 6);
        for (let t = e.end; t < e.end + tail; t++) {
          if (!inRange(t)) continue;
          const k = 1 - (t - e.end) / tail;
          etco2[t] += over * k;
          rr[t] += rrOver * k;
          hr[t] += hrRise * k;
        }
        break;
      }
      case 'desaturation': {
        const from = spo2[Math.max(0, e.start - (e.leadS ?? 10) - 1)];
        const pts = desaturationCurve(e, Math.max(from, 91), rng.int(2, 8));
        for (let t = pts[0][0]; t < pts[pts.length - 1][0]; t++) {
          if (!inRange(t)) continue;
          const c = piecewiseLinear(pts, t);
          if (c < spo2[t]) spo2[t] = c;
          if (c < 90) hr[t] += (90 - c) * 0.6;
        }
        break;
      }
      case 'hypoventilation': {
        const lead = e.leadS ?? 30;
        const tail = e.tailS ?? 30;
        const peak = e.value ?? 54;
        const from = etco2[Math.max(0, e.start - lead)];
        const to = etco2[Math.min(n - 1, e.end + tail)];
        const rrFrom = rr[Math.max(0, e.start - lead)];
        const rrLevel = e.aux ?? 9;
        for (let t = e.start - lead; t < e.end + tail; t++) {
          if (!inRange(t)) continue;
          if (t < e.start) {
            const k = (t - (e.start - lead)) / lead;
            etco2[t] = Math.max(etco2[t], from + (49.4 - from) * k);
            rr[t] = rrFrom + (rrLevel - rrFrom) * k;
          } else if (t < e.end) {
            etco2[t] = Math.max(50, peak + rng.normal(0, 0.7));
            rr[t] = clamp(rrLevel + rng.normal(0, 0.6), 8, 12);
          } else {
            const k = (t - e.end) / tail;
            etco2[t] = Math.max(etco2[t], 49.4 + (to - 49.4) * k);
            rr[t] = Math.max(8, rrLevel + (rr[t] - rrLevel) * k);
          }
        }
        break;
      }
      case 'bradypnea': {
        const level = e.value ?? 6;
        const rise = e.aux ?? 5;
        const ramp = 10;
        for (let t = e.start - ramp; t < e.end + ramp; t++) {
          if (!inRange(t)) continue;
          if (t < e.start) {
            const k = (t - (e.start - ramp)) / ramp;
            rr[t] = Math.max(8, rr[t] + (8 - rr[t]) * k);
          } else if (t < e.end) {
            rr[t] = clamp(level + rng.normal(0, 0.5), 3, 7.4);
            etco2[t] = Math.min(49.4, etco2[t] + rise * Math.min(1, (t - e.start) / 20));
          } else {
            const k = (t - e.end) / ramp;
            rr[t] = Math.max(8, 8 + (rr[t] - 8) * k);
            etco2[t] = Math.min(49.4, etco2[t] + rise * (1 - k));
          }
        }
        break;
      }
      case 'line_disconnection': {
        if (inRange(e.start)) etco2[e.start] = rng.uniform(10, 18);
        for (let t = e.start + 1; t < e.end; t++) if (inRange(t)) etco2[t] = 0;
        for (let t = e.start + 2; t < e.end; t++) if (inRange(t)) rr[t] = 0;
        break;
      }
      case 'probe_off': {
        for (let t = e.start; t < e.end; t++) {
          if (!inRange(t)) continue;
          if (e.mode === 'gap') keep[t] = 0;
          else {
            spo2[t] = 0;
            probeOff[t] = 1;
            anyProbeOff = true;
          }
        }
        break;
      }
    }
  }

  const t: number[] = [];
  const vE: number[] = [];
  const vR: number[] = [];
  const vH: number[] = [];
  const tS: number[] = [];
  const vS: number[] = [];
  const fS: boolean[] = [];
  for (let i = 0; i < n; i++) {
    t.push(i);
    vE.push(clamp(Math.round(etco2[i]), 0, 150));
    vR.push(clamp(Math.round(rr[i]), 0, 80));
    vH.push(clamp(Math.round(hr[i]), 0, 300));
    if (keep[i]) {
      tS.push(i);
      vS.push(clamp(Math.round(spo2[i]), 0, 100));
      fS.push(probeOff[i] === 1);
    }
  }
  const spo2Series: SampleSeries = { channel: 'spo2', unit: '%', source: 'monitor', t: tS, v: vS };
  if (anyProbeOff) spo2Series.probeOff = fS;
  const series: SampleSeries[] = [
    { channel: 'etco2', unit: 'mmHg', source: 'monitor', t, v: vE },
    { channel: 'rr', unit: '/min', source: 'monitor', t: t.slice(), v: vR },
    spo2Series,
    { channel: 'hr', unit: '/min', source: 'monitor', t: t.slice(), v: vH },
  ];
  return { series, effect: D, propofolEffect: Dp, hr };
}
