/**
 * Pre-sedation assessment of one visit: weight that day, BMI, STOP-Bang, ASA class, Mallampati
 * class, fasting. Invented correlations (documented in docs/demo.md), not clinical data.
 */
import type { DemoPatient } from './patient';
import { ageOn, bmiOf } from './patient';
import type { Rng } from './random';
import type { DemoAssessment, Mallampati, PlannedDepth, StopBang } from './types';
import type { ProcedureId } from './unit';

/**
 * STOP-Bang score and risk band (Chung et al. 2008; 2016).
 * @example stopBangOf({ snoring: true, tiredness: false, observedApnea: false, highBloodPressure: true, bmiOver35: false, ageOver50: true, neckOver40: false, male: true }).risk //=> 'high'
 */
export function stopBangOf(items: Omit<StopBang, 'score' | 'risk'>): StopBang {
  const stop = [items.snoring, items.tiredness, items.observedApnea, items.highBloodPressure].filter(Boolean).length;
  const score = stop + [items.bmiOver35, items.ageOver50, items.neckOver40, items.male].filter(Boolean).length;
  const high = score >= 5 || (stop >= 2 && (items.male || items.bmiOver35 || items.neckOver40));
  return { ...items, score, risk: high ? 'high' : score >= 3 ? 'intermediate' : 'low' };
}

const ROMAN = ['I', 'II', 'III', 'IV'] as const;

/** Numeric ASA class 1–4 of 'I'…'IV' with or without 'E'. @example asaNumber('IIIE') //=> 3 */
export function asaNumber(asaClass: string): number {
  return ROMAN.indexOf(asaClass.replace(/E$/, '') as (typeof ROMAN)[number]) + 1;
}

export interface AssessVisitOptions {
  /** `YYYY-MM-DD` of the visit. */
  date: string;
  procedureId: ProcedureId;
  plannedDepth: PlannedDepth;
}

export function assessVisit(rng: Rng, patient: DemoPatient, options: AssessVisitOptions): DemoAssessment {
  const ageYears = ageOn(patient.birthDate, options.date);
  const weightKg = Math.round((patient.weightKg + rng.normal(0, 1.5)) * 2) / 2;
  const heightCm = patient.heightCm;
  const bmiExact = bmiOf(weightKg, heightCm);
  const bmi = Math.round(bmiExact * 10) / 10;
  const stopBang = stopBangOf({
    snoring: patient.history.snoring,
    tiredness: patient.history.tiredness,
    observedApnea: patient.history.observedApnea,
    highBloodPressure: patient.history.hypertension,
    bmiOver35: bmiExact > 35,
    ageOver50: ageYears > 50,
    neckOver40: patient.history.neckOver40,
    male: patient.sex === 'male',
  });
  // ASA: a latent score rising with age, BMI and STOP-Bang; cut points give ≈ 22 / 50 / 23 / 5 %.
  const z = 0.035 * (ageYears - 58) + 0.07 * (bmiExact - 27) + 0.15 * (stopBang.score - 3) + rng.normal();
  const asaN = z < -0.9 ? 1 : z < 0.75 ? 2 : z < 2.0 ? 3 : 4;
  const emergencyP = options.procedureId === 'ercp' ? 0.06 : 0.008;
  const emergency = asaN >= 2 && rng.bernoulli(emergencyP);
  const asaClass = ROMAN[asaN - 1] + (emergency ? 'E' : '');
  // Mallampati: latent score with BMI and neck size; ≈ 35 / 35 / 22 / 8 %.
  const m = 0.08 * (bmiExact - 27) + 0.3 * (patient.history.neckOver40 ? 1 : 0) + rng.normal();
  const mallampati: Mallampati = m < -0.4 ? 'I' : m < 0.55 ? 'II' : m < 1.45 ? 'III' : 'IV';
  const solidsH = emergency && rng.bernoulli(0.3)
    ? rng.uniform(3, 6)
    : rng.bernoulli(0.85) ? rng.uniform(10, 16) : rng.uniform(6, 10);
  const clearFluidsH = rng.bernoulli(0.85) ? rng.uniform(2, 4.5) : rng.uniform(4.5, 12);
  const half = (h: number) => Math.round(h * 2) / 2;
  return {
    ageYears,
    sex: patient.sex,
    weightKg,
    heightCm,
    bmi,
    asaClass,
    plannedDepth: options.plannedDepth,
    mallampati,
    stopBang,
    fasting: { solidsH: half(solidsH), clearFluidsH: Math.min(half(clearFluidsH), half(solidsH)) },
  };
}
