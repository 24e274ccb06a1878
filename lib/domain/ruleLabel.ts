import type { CaseLevel } from './intervention';

/** Readable names of the built-in rule ids; other ids show as written. */
export const RULE_LABEL: Record<string, string> = {
  apnea: 'Apnea',
  prolonged_apnea: 'Prolonged apnea',
  hypoventilation: 'High EtCO2 (hypoventilation)',
  low_etco2: 'Falling EtCO2',
  bradypnea: 'Slow breathing (bradypnea)',
  hypoxemia: 'Hypoxemia',
  severe_hypoxemia: 'Severe hypoxemia',
  prolonged_hypoxemia: 'Prolonged hypoxemia',
  critical_hypoxemia: 'Critical hypoxemia',
};

export function ruleLabel(id: string): string {
  return RULE_LABEL[id] ?? id.replace(/_/g, ' ');
}

/** Plateau's own names for the four severity levels (rules.md §6). */
export const LEVEL_LABEL: Record<CaseLevel, string> = {
  none: 'No event',
  observed: 'Observed only',
  corrected: 'Corrected at the bedside',
  supported: 'Breathing supported',
  rescued: 'Rescue',
};

/** The hint shown for an apnea whose EtCO2 fell abruptly to zero (rules.md §5). */
export const ABRUPT_ZERO_HINT =
  'EtCO2 fell abruptly to zero: this may be apnea, a disconnected or blocked sampling line, a dislodged airway, or loss of circulation. Check the patient and the line.';
