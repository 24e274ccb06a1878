import { KNOWN_DRUG_CLASS } from './drug';

export const REGIMENS = ['propofol', 'propofol_opioid', 'benzodiazepine_opioid', 'ketamine', 'benzodiazepine', 'other', 'none'] as const;
export type Regimen = (typeof REGIMENS)[number];

export const REGIMEN_LABEL: Record<Regimen, string> = {
  propofol: 'Propofol alone',
  propofol_opioid: 'Propofol with an opioid',
  benzodiazepine_opioid: 'Midazolam with an opioid',
  ketamine: 'Ketamine (± other)',
  benzodiazepine: 'Midazolam alone',
  other: 'Other combination',
  none: 'No sedative recorded',
};

/**
 * The regimen a case's sedative and opioid doses add up to (reversal agents ignored).
 * @example regimenOf(['propofol', 'fentanyl']) //=> 'propofol_opioid'
 */
export function regimenOf(drugs: readonly string[]): Regimen {
  const set = new Set(drugs.map((d) => d.toLowerCase()));
  const opioid = [...set].some((d) => KNOWN_DRUG_CLASS[d] === 'opioid');
  const benzo = set.has('midazolam') || set.has('remimazolam') || set.has('diazepam');
  if (set.has('ketamine')) return 'ketamine';
  if (set.has('propofol')) return opioid || benzo ? (opioid ? 'propofol_opioid' : 'other') : 'propofol';
  if (benzo) return opioid ? 'benzodiazepine_opioid' : 'benzodiazepine';
  if (opioid) return 'other';
  return [...set].some((d) => KNOWN_DRUG_CLASS[d] === 'sedative') ? 'other' : 'none';
}

/** Bands used in breakdowns (Plateau's choice of cut points). */
export function bmiBand(bmi: number | null): string {
  if (bmi === null) return 'unknown';
  return bmi < 18.5 ? '< 18.5' : bmi < 25 ? '18.5–24.9' : bmi < 30 ? '25–29.9' : bmi < 35 ? '30–34.9' : bmi < 40 ? '35–39.9' : '≥ 40';
}

export function ageBand(age: number | null): string {
  if (age === null) return 'unknown';
  return age < 18 ? '< 18' : age < 40 ? '18–39' : age < 60 ? '40–59' : age < 70 ? '60–69' : age < 80 ? '70–79' : '≥ 80';
}
