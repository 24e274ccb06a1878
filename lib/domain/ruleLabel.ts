import type { CaseLevel } from './intervention';

/**
 * Words every screen, note and report uses for rules and levels — one table, so the bedside,
 * the note and the review say the same thing. Rule ids of the built-in rule sets have a label;
 * a rule of a saved set without one is shown by its id in words ("my_rule" → "My rule").
 */
export const RULE_LABEL: Record<string, string> = {
  apnea: 'Apnea',
  prolonged_apnea: 'Prolonged apnea',
  hypoventilation: 'Hypoventilation',
  low_etco2: 'Low EtCO2',
  bradypnea: 'Bradypnea',
  hypoxemia: 'Hypoxemia',
  severe_hypoxemia: 'Severe hypoxemia',
  prolonged_hypoxemia: 'Prolonged hypoxemia',
  critical_hypoxemia: 'Critical hypoxemia',
  respiratory_depression: 'Respiratory depression',
  hypoxia: 'Hypoxia',
  apnea_20s: 'Apnea ≥ 20 s',
  hypopnea: 'Hypopnea',
  desaturation: 'Desaturation',
  prolonged_desaturation: 'Prolonged desaturation',
  critical_desaturation: 'Critical desaturation',
  hypercapnia: 'Hypercapnia',
  capnographic_change: 'Capnographic change',
  loss_of_waveform: 'Loss of waveform',
};

/**
 * @example ruleLabel('prolonged_apnea') //=> "Prolonged apnea"
 * @example ruleLabel('my_rule') //=> "My rule"
 */
export function ruleLabel(ruleId: string): string {
  const known = RULE_LABEL[ruleId];
  if (known !== undefined) return known;
  const words = ruleId.replace(/_/g, ' ');
  return words.charAt(0).toUpperCase() + words.slice(1);
}

/** Plateau's own names for the severity levels (rules.md §6). */
export const LEVEL_LABEL: Record<CaseLevel, string> = {
  none: 'None',
  observed: 'Observed',
  corrected: 'Corrected',
  supported: 'Supported',
  rescued: 'Rescued',
};

/** What each level means, in the words of rules.md §6. */
export const LEVEL_MEANING: Record<CaseLevel, string> = {
  none: 'no respiratory episode and no intervention',
  observed: 'episodes without any intervention',
  corrected: 'stimulation, chin lift or jaw thrust, more oxygen, nasal or oral airway, or sedation paused',
  supported: 'bag-mask or other positive-pressure ventilation, supraglottic airway, reversal agent, or procedure stopped early',
  rescued: 'tracheal intubation, chest compressions, unplanned ICU admission or transfer, or death',
};

/** The hint an abrupt-onset apnea carries (rules.md §5), as a clause. */
export const ABRUPT_APNEA_HINT = 'may also be a disconnected or blocked sampling line, a dislodged airway, or loss of circulation';

/** The same hint as a sentence for the bedside. */
export const ABRUPT_ZERO_HINT = `EtCO2 fell abruptly to zero. Besides apnea, this ${ABRUPT_APNEA_HINT}. Check the patient and the line.`;
