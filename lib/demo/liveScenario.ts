/**
 * Live monitor scenarios for a bedside simulator: an endless 1 Hz stream of EtCO2 (mmHg),
 * RR (/min), SpO2 (%) and HR (/min) values, one second at a time.
 * - calm: a sedated patient breathing steadily;
 * - apnea: calm stretches of 60–120 s broken by apneas of 25–45 s (EtCO2 < 5, RR 0) that recover;
 * - hypoxemia: calm stretches, then an apnea of 40–55 s followed 35–50 s after its onset by SpO2
 *   < 90 % for 30–50 s (nadir 80–86 %), then recovery.
 */
import type { Rng } from './random';
import { desaturationCurve, piecewiseLinear } from './signals';

export const LIVE_SCENARIOS = ['calm', 'apnea', 'hypoxemia'] as const;
export type LiveScenario = (typeof LIVE_SCENARIOS)[number];

export interface LiveSample {
  t: number;
  etco2: number;
  rr: number;
  spo2: number;
  hr: number;
}

export interface LiveScenarioOptions {
  /** Stop after this many samples; endless when omitted. */
  durationS?: number;
}

interface Cycle {
  /** Cycle length, s. */
  length: number;
  apnea: { start: number; end: number; lead: number; tail: number; over: number } | null;
  desat: (readonly [number, number])[] | null;
}

function nextCycle(rng: Rng, scenario: LiveScenario): Cycle {
  if (scenario === 'calm') return { length: 600, apnea: null, desat: null };
  const calm = scenario === 'apnea' ? rng.int(60, 120) : rng.int(60, 90);
  const dur = scenario === 'apnea' ? rng.int(25, 45) : rng.int(40, 55);
  const apnea = { start: calm, end: calm + dur, lead: rng.int(12, 16), tail: rng.int(25, 40), over: rng.uniform(4, 8) };
  if (scenario === 'apnea') return { length: apnea.end + apnea.tail, apnea, desat: null };
  const onset = calm + rng.int(35, 50);
  const e = { kind: 'desaturation' as const, start: onset, end: onset + rng.int(30, 50), value: rng.int(80, 86), leadS: rng.int(10, 15), tailS: rng.int(20, 35) };
  const desat = desaturationCurve(e, 100, rng.int(3, 8));
  return { length: Math.max(apnea.end + apnea.tail, e.end + e.tailS) + 5, apnea, desat };
}

/**
 * An endless (or `durationS`-long) stream of samples at t = startT, startT + 1, …
 * @example [...liveScenarioStream(createRng(3), 'calm', 100, { durationS: 2 })].map((s) => s.t) //=> [100, 101]
 */
export function* liveScenarioStream(rng: Rng, scenario: LiveScenario, startT: number, options: LiveScenarioOptions = {}): Generator<LiveSample, void, void> {
  const base = { etco2: rng.uniform(34, 42), rr: rng.uniform(11, 17), spo2: rng.uniform(97, 99.6), hr: rng.uniform(62, 88) };
  let wE = 0;
  let wR = 0;
  let wS = 0;
  let wH = 0;
  let cycle = nextCycle(rng, scenario);
  let u = 0;
  for (let i = 0; options.durationS === undefined || i < options.durationS; i++, u++) {
    if (u >= cycle.length) {
      cycle = nextCycle(rng, scenario);
      u = 0;
    }
    wE = 0.97 * wE + rng.normal(0, 0.3);
    wR = 0.95 * wR + rng.normal(0, 0.35);
    wS = 0.98 * wS + rng.normal(0, 0.1);
    wH = 0.97 * wH + rng.normal(0, 0.5);
    let etco2 = Math.min(47, base.etco2 + wE + rng.normal(0, 0.5));
    let rr = Math.max(9, base.rr + wR + rng.normal(0, 0.5));
    let spo2 = Math.min(100, Math.max(94, base.spo2 + wS + rng.normal(0, 0.3)));
    let hr = base.hr + wH + rng.normal(0, 1);
    const a = cycle.apnea;
    if (a) {
      if (u >= a.start - a.lead && u < a.start) etco2 = etco2 + (5.6 - etco2) * ((u - (a.start - a.lead)) / a.lead);
      else if (u >= a.start && u < a.end) {
        etco2 = rng.weighted([[0, 75], [1, 15], [2, 10]] as const);
        rr = 0;
        hr += 5 * Math.min(1, (u - a.start) / 15);
      } else if (u >= a.end && u < a.end + a.tail) {
        const k = 1 - (u - a.end) / a.tail;
        etco2 += a.over * k;
        rr += 4 * k;
        hr += 5 * k;
      }
    }
    if (cycle.desat) {
      const c = piecewiseLinear(cycle.desat, u);
      if (c < spo2) spo2 = c;
      if (c < 90) hr += (90 - c) * 0.6;
    }
    yield { t: startT + i, etco2: Math.max(0, Math.round(etco2)), rr: Math.max(0, Math.round(rr)), spo2: Math.round(spo2), hr: Math.round(hr) };
  }
}
