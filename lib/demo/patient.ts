/**
 * Fictional demo patients: name, sex, birth date, a stable height and usual weight, and the
 * STOP-Bang history items that belong to the person (snoring, tiredness, observed apnoea, high
 * blood pressure, neck > 40 cm). Age- and BMI-dependent items are worked out per visit.
 */
import type { Rng } from './random';
import { FAMILY_NAMES, FEMALE_GIVEN_NAMES, MALE_GIVEN_NAMES } from './names';
import { addDays, parseDate } from './zonedTime';

export interface DemoPatient {
  /** Fictional medical record number, e.g. 'KBD-000123'. */
  mrn: string;
  givenName: string;
  familyName: string;
  displayName: string;
  /** The demo draws female and male only (height and weight models are per sex). */
  sex: 'female' | 'male';
  /** `YYYY-MM-DD`. */
  birthDate: string;
  heightCm: number;
  /** Usual weight; a visit's weight varies a little around it. */
  weightKg: number;
  history: {
    snoring: boolean;
    tiredness: boolean;
    observedApnea: boolean;
    hypertension: boolean;
    neckOver40: boolean;
  };
}

export interface GenerateDemoPatientOptions {
  /** 1-based patient number; the MRN is `${mrnPrefix}-${index padded to 6}`. */
  index: number;
  mrnPrefix: string;
  /** `YYYY-MM-DD` the ages are drawn relative to (the unit's "today"). */
  referenceDate: string;
}

function logistic(x: number): number {
  return 1 / (1 + Math.exp(-x));
}

/** BMI from weight and height. @example bmiOf(81, 180) //=> 25 */
export function bmiOf(weightKg: number, heightCm: number): number {
  const m = heightCm / 100;
  return weightKg / (m * m);
}

/** Whole years between a birth date and a date (both `YYYY-MM-DD`). @example ageOn('1970-06-15', '2026-06-14') //=> 55 */
export function ageOn(birthDate: string, date: string): number {
  const b = parseDate(birthDate);
  const d = parseDate(date);
  let age = d.year - b.year;
  if (d.month < b.month || (d.month === b.month && d.day < b.day)) age--;
  return age;
}

/**
 * One fictional patient. Ages on the reference date: 19–93 (adults on every visit of the last
 * months), skewed older (endoscopy lists): normal mean 58 y,
 * SD 15. Height by sex (female 163 ± 7 cm, male 177 ± 7.5 cm). BMI: 87 % from 26.5 ± 4, 13 %
 * from 38.5 ± 4 (so roughly one in nine is above 35). History items rise with BMI, age and male sex.
 */
export function generateDemoPatient(rng: Rng, options: GenerateDemoPatientOptions): DemoPatient {
  const sex: 'female' | 'male' = rng.bernoulli(0.5) ? 'female' : 'male';
  const givenName = rng.pick(sex === 'female' ? FEMALE_GIVEN_NAMES : MALE_GIVEN_NAMES);
  const familyName = rng.pick(FAMILY_NAMES);
  const ageYears = rng.normalClipped(58, 15, 19, 93);
  const birthDate = addDays(options.referenceDate, -Math.round(ageYears * 365.2425));
  const heightCm = Math.round(sex === 'female' ? rng.normalClipped(163, 7, 145, 185) : rng.normalClipped(177, 7.5, 155, 200));
  const bmi = rng.bernoulli(0.13) ? rng.normalClipped(38.5, 4, 33, 55) : rng.normalClipped(26.5, 4, 17, 40);
  const weightKg = Math.round(bmi * (heightCm / 100) ** 2 * 2) / 2;
  const male = sex === 'male' ? 1 : 0;
  const age = ageYears;
  const history = {
    snoring: rng.bernoulli(logistic(-2.2 + 0.12 * (bmi - 25) + 0.8 * male + 0.02 * (age - 50))),
    tiredness: rng.bernoulli(logistic(-1.6 + 0.05 * (bmi - 25))),
    observedApnea: rng.bernoulli(logistic(-3.6 + 0.15 * (bmi - 25) + 0.9 * male + 0.02 * (age - 50))),
    hypertension: rng.bernoulli(logistic(-1.4 + 0.06 * (bmi - 25) + 0.055 * (age - 50) + 0.2 * male)),
    neckOver40: rng.bernoulli(logistic(-3.2 + 0.25 * (bmi - 25) + 2.2 * male)),
  };
  const mrn = `${options.mrnPrefix}-${String(options.index).padStart(6, '0')}`;
  return { mrn, givenName, familyName, displayName: `${givenName} ${familyName}`, sex, birthDate, heightCm, weightKg, history };
}
