/** Labels and definitions of the case facts the bedside records. */
export const CASE_STATUSES = ['draft', 'in_progress', 'recovery', 'signed'] as const;
export type CaseStatus = (typeof CASE_STATUSES)[number];

export const STATUS_LABEL: Record<string, string> = {
  draft: 'Not started',
  in_progress: 'Under sedation',
  recovery: 'In recovery',
  signed: 'Note signed',
};

export const PROCEDURE_LABEL: Record<string, string> = {
  gastroscopy: 'Gastroscopy',
  colonoscopy: 'Colonoscopy',
  ercp: 'ERCP',
  eus: 'EUS',
  bronchoscopy: 'Bronchoscopy',
};

/** ASA continuum of depth of sedation (ASA). */
export const DEPTHS = ['minimal', 'moderate', 'deep', 'general'] as const;
export type Depth = (typeof DEPTHS)[number];
export const DEPTH_LABEL: Record<string, string> = {
  minimal: 'Minimal sedation',
  moderate: 'Moderate sedation',
  deep: 'Deep sedation',
  general: 'General anaesthesia',
};
export const DEPTH_MEANING: Record<Depth, string> = {
  minimal: 'Normal response to verbal stimulation; airway, breathing and circulation unaffected.',
  moderate: 'Purposeful response to verbal or light tactile stimulation; no airway intervention needed; breathing adequate.',
  deep: 'Purposeful response only after repeated or painful stimulation; airway help may be needed; breathing may be inadequate.',
  general: 'Not rousable even by painful stimulation; airway help often needed; breathing often inadequate; circulation may be impaired.',
};

/** ASA physical status classes (ASA). */
export const ASA_CLASSES = ['I', 'II', 'III', 'IV', 'V', 'VI'] as const;
export const ASA_MEANING: Record<(typeof ASA_CLASSES)[number], string> = {
  I: 'A normal healthy patient',
  II: 'A patient with mild systemic disease',
  III: 'A patient with severe systemic disease',
  IV: 'A patient with severe systemic disease that is a constant threat to life',
  V: 'A moribund patient who is not expected to survive without the operation',
  VI: 'A declared brain-dead patient whose organs are being removed for donor purposes',
};

/**
 * Body-mass index from weight and height.
 * @example bmi(82, 175) //=> 26.8
 */
export function bmi(weightKg: number | null | undefined, heightCm: number | null | undefined): number | null {
  if (!weightKg || !heightCm) return null;
  const m = heightCm / 100;
  return Math.round((weightKg / (m * m)) * 10) / 10;
}
