import { z } from 'zod';

/**
 * STOP-Bang screening questionnaire for obstructive sleep apnoea.
 *
 * Sources: Chung F et al. 2008, Anesthesiology 108:812-21 (the eight yes/no items, the cut-offs
 * BMI > 35 kg/m², age > 50 years, neck circumference > 40 cm, male sex); Chung F et al. 2016,
 * Chest 149:631-8 (the stratification: 0–2 low, 3–4 intermediate, 5–8 high risk; also high risk
 * with ≥ 2 of the four STOP items plus male sex, or plus BMI > 35 kg/m², or plus a large neck).
 * The 2016 paper words the neck item as a shirt collar of 17 in (men) / 16 in (women) or more;
 * Plateau measures the neck and uses the 2008 cut-off (> 40 cm), as references.md says.
 */

export const STOP_BANG_ITEMS = ['snoring', 'tired', 'observedApnea', 'pressure', 'bmiOver35', 'ageOver50', 'neckOver40', 'male'] as const;
export type StopBangItem = (typeof STOP_BANG_ITEMS)[number];
export type StopBangItems = Record<StopBangItem, boolean>;

/** The four patient-answered items (S, T, O, P); the other four (B, A, N, G) come from facts. */
export const STOP_ITEMS = ['snoring', 'tired', 'observedApnea', 'pressure'] as const satisfies readonly StopBangItem[];
export type StopAnswers = Record<(typeof STOP_ITEMS)[number], boolean>;

export interface StopBangItemSpec {
  /** The letter of the acronym. */
  letter: 'S' | 'T' | 'O' | 'P' | 'B' | 'A' | 'N' | 'G';
  label: string;
  /** The question as asked (STOP) or the rule that answers it (Bang). */
  question: string;
  /** Answered by the patient (STOP items) or derived from measured facts (Bang items). */
  from: 'patient' | 'facts';
}

/** Labels and questions of the eight items, in questionnaire order (wording after Chung et al. 2016). */
export const STOP_BANG_SPECS: Record<StopBangItem, StopBangItemSpec> = {
  snoring: { letter: 'S', label: 'Snoring', question: 'Do you snore loudly (louder than talking, or loud enough to be heard through closed doors, or your bed partner elbows you for snoring at night)?', from: 'patient' },
  tired: { letter: 'T', label: 'Tired', question: 'Do you often feel tired, fatigued, or sleepy during the daytime (such as falling asleep while driving or talking to someone)?', from: 'patient' },
  observedApnea: { letter: 'O', label: 'Observed apnoea', question: 'Has anyone observed you stop breathing or choking/gasping during your sleep?', from: 'patient' },
  pressure: { letter: 'P', label: 'Pressure', question: 'Do you have or are you being treated for high blood pressure?', from: 'patient' },
  bmiOver35: { letter: 'B', label: 'BMI > 35', question: 'Body-mass index more than 35 kg/m²?', from: 'facts' },
  ageOver50: { letter: 'A', label: 'Age > 50', question: 'Age older than 50 years?', from: 'facts' },
  neckOver40: { letter: 'N', label: 'Neck > 40 cm', question: 'Neck circumference (measured around the Adam’s apple) more than 40 cm?', from: 'facts' },
  male: { letter: 'G', label: 'Male', question: 'Gender: male?', from: 'facts' },
};

export type StopBangBand = 'low' | 'intermediate' | 'high';

export const STOP_BANG_BAND_LABEL: Record<StopBangBand, string> = {
  low: 'Low risk of OSA',
  intermediate: 'Intermediate risk of OSA',
  high: 'High risk of OSA',
};

export interface StopBangResult {
  /** Number of "yes" items, 0–8. */
  score: number;
  /** Number of "yes" among the four STOP items, 0–4. */
  stopScore: number;
  band: StopBangBand;
  /** Why the band is what it is, one line per rule that applied. */
  reasons: string[];
}

export const StopBangItemsSchema = z.object(Object.fromEntries(STOP_BANG_ITEMS.map((k) => [k, z.boolean({ message: 'must be yes or no' })])) as Record<StopBangItem, z.ZodBoolean>);

/**
 * STOP-Bang score and risk band (Chung et al. 2008; 2016).
 * @example stopBang({ snoring: true, tired: true, observedApnea: false, pressure: false, bmiOver35: false, ageOver50: false, neckOver40: false, male: true }).band //=> 'high'
 */
export function stopBang(items: StopBangItems): StopBangResult {
  const stopScore = STOP_ITEMS.filter((k) => items[k]).length;
  const score = STOP_BANG_ITEMS.filter((k) => items[k]).length;
  const reasons: string[] = [];
  let band: StopBangBand = score >= 5 ? 'high' : score >= 3 ? 'intermediate' : 'low';
  reasons.push(`score ${score} of 8: ${score >= 5 ? '5–8 is high risk' : score >= 3 ? '3–4 is intermediate risk' : '0–2 is low risk'}`);
  if (band !== 'high' && stopScore >= 2) {
    const extra = (['male', 'bmiOver35', 'neckOver40'] as const).filter((k) => items[k]);
    if (extra.length > 0) {
      band = 'high';
      const words = { male: 'male sex', bmiOver35: 'BMI > 35', neckOver40: 'neck > 40 cm' } as const;
      reasons.push(`${stopScore} of the 4 STOP items plus ${extra.map((k) => words[k]).join(', ')}: high risk`);
    }
  }
  return { score, stopScore, band, reasons };
}

export interface StopBangFacts {
  /** The patient's answers to the four STOP items. */
  answers: StopAnswers & {
    /** Used only when neckCm is not measured: the neck item answered directly (e.g. collar size). */
    neckOver40?: boolean | null;
  };
  /** kg/m²; null when weight or height is unknown. */
  bmi: number | null | undefined;
  /** Whole years at the assessment. */
  age: number | null | undefined;
  sex: 'female' | 'male' | 'other' | 'unknown' | null | undefined;
  neckCm?: number | null;
}

export interface StopBangFromFactsResult extends StopBangResult {
  items: StopBangItems;
  /** Bang items whose fact was unknown and so counted as "no": the score is then a lower bound. */
  unknown: StopBangItem[];
}

/**
 * Derives the B, A, N and G items from measured facts (BMI > 35, age > 50, neck > 40 cm,
 * male) and scores the whole questionnaire. An unknown fact counts as "no" and is named in
 * `unknown` and in the reasons, so the screen can say the score may be higher.
 * @example stopBangFromFacts({ answers: { snoring: true, tired: false, observedApnea: false, pressure: true }, bmi: 36.2, age: 50, sex: 'female', neckCm: 38 }).score //=> 3
 */
export function stopBangFromFacts(f: StopBangFacts): StopBangFromFactsResult {
  const unknown: StopBangItem[] = [];
  const bmiKnown = typeof f.bmi === 'number' && Number.isFinite(f.bmi);
  const ageKnown = typeof f.age === 'number' && Number.isFinite(f.age);
  const neckMeasured = typeof f.neckCm === 'number' && Number.isFinite(f.neckCm);
  const neckAnswered = typeof f.answers.neckOver40 === 'boolean';
  const sexKnown = f.sex === 'male' || f.sex === 'female';
  if (!bmiKnown) unknown.push('bmiOver35');
  if (!ageKnown) unknown.push('ageOver50');
  if (!neckMeasured && !neckAnswered) unknown.push('neckOver40');
  if (!sexKnown) unknown.push('male');
  const items: StopBangItems = {
    snoring: f.answers.snoring,
    tired: f.answers.tired,
    observedApnea: f.answers.observedApnea,
    pressure: f.answers.pressure,
    bmiOver35: bmiKnown && (f.bmi as number) > 35,
    ageOver50: ageKnown && (f.age as number) > 50,
    neckOver40: neckMeasured ? (f.neckCm as number) > 40 : f.answers.neckOver40 === true,
    male: f.sex === 'male',
  };
  const r = stopBang(items);
  const reasons = [...r.reasons];
  if (unknown.length > 0) reasons.push(`not known, counted as no: ${unknown.map((k) => STOP_BANG_SPECS[k].label).join(', ')} (the score may be higher)`);
  return { ...r, reasons, items, unknown };
}
