/**
 * Drug classes and the units a dose may be recorded in.
 * "Sedative dose" in the rules (baseline window, last dose before an episode) means a drug
 * of class `sedative` or `opioid`: both depress breathing. Plateau's choice, see DEVELOPERS.md.
 */
export const DRUG_CLASSES = ['sedative', 'opioid', 'reversal', 'other'] as const;
export type DrugClass = (typeof DRUG_CLASSES)[number];

export const DOSE_UNITS = ['mg', 'mcg', 'g', 'mL', 'units'] as const;
export type DoseUnit = (typeof DOSE_UNITS)[number];

export const ROUTES = ['IV', 'IM', 'IN', 'PO', 'SC', 'INH'] as const;
export type Route = (typeof ROUTES)[number];

/** Known drugs and their class; a unit's formulary may add others (class given there). */
export const KNOWN_DRUG_CLASS: Record<string, DrugClass> = {
  propofol: 'sedative',
  midazolam: 'sedative',
  remimazolam: 'sedative',
  ketamine: 'sedative',
  dexmedetomidine: 'sedative',
  etomidate: 'sedative',
  diazepam: 'sedative',
  fentanyl: 'opioid',
  alfentanil: 'opioid',
  remifentanil: 'opioid',
  pethidine: 'opioid',
  morphine: 'opioid',
  hydromorphone: 'opioid',
  naloxone: 'reversal',
  flumazenil: 'reversal',
};

/** True when a drug counts as a sedative dose for the rules (sedatives and opioids). */
export function isSedativeDrug(drug: string, drugClass?: DrugClass): boolean {
  const c = drugClass ?? KNOWN_DRUG_CLASS[drug.toLowerCase()] ?? 'other';
  return c === 'sedative' || c === 'opioid';
}
