/**
 * Manual blood pressure readings during the case and modified Aldrete scores in recovery.
 * Invented model for the demo.
 */
import type { Rng } from './random';
import type { AldreteScore, ManualVital, Regimen } from './types';

export interface ManualVitalsOptions {
  endS: number;
  ageYears: number;
  hypertension: boolean;
  /** Drug effect per second and propofol-only effect (from the signal synthesis). */
  effect: Float64Array;
  propofolEffect: Float64Array;
  /** Monitor HR per second. */
  hr: Float64Array;
  procedureStart: number;
}

/** A cuff reading every 3–5 min from the first minute until the patient leaves the room. */
export function manualVitals(rng: Rng, o: ManualVitalsOptions): ManualVital[] {
  const sbpBase = rng.normalClipped(122 + 0.35 * (o.ageYears - 50) + (o.hypertension ? 12 : 0), 12, 95, 185);
  const out: ManualVital[] = [];
  for (let t = rng.int(20, 90); t <= o.endS; t += rng.int(180, 300)) {
    const dp = Math.min(1, o.propofolEffect[t]);
    const dOther = Math.min(1, Math.max(0, o.effect[t] - o.propofolEffect[t]));
    const stim = t >= o.procedureStart ? Math.exp(-(t - o.procedureStart) / 150) : 0;
    const sbp = Math.round(sbpBase * (1 - 0.14 * dp - 0.05 * dOther) + 8 * stim + rng.normal(0, 5));
    const dbp = Math.round(sbp * rng.uniform(0.55, 0.65) + rng.normal(0, 3));
    out.push({ t, sbp, dbp, hr: Math.round(o.hr[t] + rng.normal(0, 1.5)) });
  }
  return out;
}

export interface RecoveryOptions {
  recoveryStart: number;
  regimen: Regimen;
  /** The case had a serious respiratory event (slower, more careful recovery). */
  eventful: boolean;
  spo2Air: number;
}

export interface RecoveryCourse {
  aldrete: AldreteScore[];
  discharge: number;
}

const total = (s: Omit<AldreteScore, 't' | 'total'>) => s.activity + s.respiration + s.circulation + s.consciousness + s.spo2;

/**
 * Aldrete scores from recovery start every 5–10 min (10–15 min after midazolam) until ≥ 9,
 * then discharge 10–25 min later (20–45 min after midazolam or ketamine).
 */
export function recoveryCourse(rng: Rng, o: RecoveryOptions): RecoveryCourse {
  const slow = o.regimen === 'midazolam_fentanyl' || o.regimen === 'ketamine';
  const s = {
    activity: rng.bernoulli(slow ? 0.2 : 0.4) ? 2 : 1,
    respiration: o.eventful && rng.bernoulli(0.5) ? 1 : 2,
    circulation: rng.bernoulli(0.9) ? 2 : 1,
    consciousness: rng.bernoulli(slow ? 0.05 : 0.01) ? 0 : rng.bernoulli(slow ? 0.1 : 0.3) ? 2 : 1,
    spo2: o.spo2Air >= 96 && rng.bernoulli(0.75) ? 2 : 1,
  };
  const aldrete: AldreteScore[] = [];
  let t = o.recoveryStart;
  for (let step = 0; ; step++) {
    aldrete.push({ t, ...s, total: total(s) });
    if (total(s) >= 9) break;
    t += slow ? rng.int(600, 900) : rng.int(300, 600);
    const force = step >= 5;
    for (const k of ['consciousness', 'activity', 'respiration', 'circulation', 'spo2'] as const) {
      if (s[k] < 2 && (force || rng.bernoulli(0.55))) s[k]++;
    }
  }
  const discharge = t + (slow ? rng.int(1200, 2700) : rng.int(600, 1500));
  return { aldrete, discharge: Math.max(discharge, o.recoveryStart + 1200) };
}
