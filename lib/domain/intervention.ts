/**
 * Intervention kinds (rules.md §7) and the severity level each one implies (rules.md §6).
 * This is the one table of them in the code.
 */
export const LEVELS = ['observed', 'corrected', 'supported', 'rescued'] as const;
export type Level = (typeof LEVELS)[number];
/** Case level adds `none`: no episode and no intervention. */
export type CaseLevel = 'none' | Level;

export const INTERVENTION_LEVEL = {
  stimulation: 'corrected',
  chin_lift: 'corrected',
  jaw_thrust: 'corrected',
  oxygen_increase: 'corrected',
  nasal_airway: 'corrected',
  oral_airway: 'corrected',
  sedation_paused: 'corrected',
  bag_mask: 'supported',
  supraglottic_airway: 'supported',
  naloxone: 'supported',
  flumazenil: 'supported',
  procedure_stopped: 'supported',
  intubation: 'rescued',
  chest_compressions: 'rescued',
  icu_transfer: 'rescued',
  death: 'rescued',
} as const satisfies Record<string, Level>;

export type InterventionKind = keyof typeof INTERVENTION_LEVEL;
export const INTERVENTION_KINDS = Object.keys(INTERVENTION_LEVEL) as InterventionKind[];

export const INTERVENTION_LABEL: Record<InterventionKind, string> = {
  stimulation: 'Verbal / tactile stimulation',
  chin_lift: 'Chin lift',
  jaw_thrust: 'Jaw thrust',
  oxygen_increase: 'More oxygen',
  nasal_airway: 'Nasal airway',
  oral_airway: 'Oral airway',
  sedation_paused: 'Sedation paused',
  bag_mask: 'Bag-mask ventilation',
  supraglottic_airway: 'Supraglottic airway',
  naloxone: 'Naloxone',
  flumazenil: 'Flumazenil',
  procedure_stopped: 'Procedure stopped early',
  intubation: 'Tracheal intubation',
  chest_compressions: 'Chest compressions',
  icu_transfer: 'Unplanned ICU admission / transfer',
  death: 'Death',
};

/** Numeric rank of a level, for taking the highest. */
export function levelRank(level: CaseLevel): number {
  return level === 'none' ? -1 : LEVELS.indexOf(level);
}
