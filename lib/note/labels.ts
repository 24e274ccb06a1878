import type { Channel } from '@/lib/domain/channel';
import type { CaseLevel } from '@/lib/domain/intervention';

/**
 * Words the note uses for rules, channels and levels. Rule ids of the built-in rule sets have a
 * label here; a rule of a saved set without one is shown by its id in words ("low_etco2" → "Low etco2").
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

export const CHANNEL_LABEL: Record<Channel, string> = { etco2: 'EtCO2', rr: 'RR', spo2: 'SpO2', hr: 'HR', inspco2: 'Inspired CO2' };

export const CASE_LEVEL_LABEL: Record<CaseLevel, string> = {
  none: 'None',
  observed: 'Observed',
  corrected: 'Corrected',
  supported: 'Supported',
  rescued: 'Rescued',
};

/** What each level means, in the words of rules.md §6. */
export const CASE_LEVEL_MEANING: Record<CaseLevel, string> = {
  none: 'no respiratory episode and no intervention',
  observed: 'episodes without any intervention',
  corrected: 'stimulation, chin lift or jaw thrust, more oxygen, nasal or oral airway, or sedation paused',
  supported: 'bag-mask or other positive-pressure ventilation, supraglottic airway, reversal agent, or procedure stopped early',
  rescued: 'tracheal intubation, chest compressions, unplanned ICU admission or transfer, or death',
};

/** The hint an abrupt-onset apnea carries (rules.md §5). */
export const ABRUPT_APNEA_HINT = 'may also be a disconnected or blocked sampling line, a dislodged airway, or loss of circulation';

/** The request a case with major physiology carries (rules.md §6). */
export const CONFIRM_INTERVENTIONS_REQUEST =
  'Major physiology (prolonged apnea, prolonged or critical hypoxemia): confirm that every intervention given is recorded above.';
