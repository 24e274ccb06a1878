import type { Channel } from '@/lib/domain/channel';

export { RULE_LABEL, ruleLabel, ABRUPT_APNEA_HINT } from '@/lib/domain/ruleLabel';
export { LEVEL_LABEL as CASE_LEVEL_LABEL, LEVEL_MEANING as CASE_LEVEL_MEANING } from '@/lib/domain/ruleLabel';

export const CHANNEL_LABEL: Record<Channel, string> = { etco2: 'EtCO2', rr: 'RR', spo2: 'SpO2', hr: 'HR', inspco2: 'Inspired CO2' };

/** The request a case with major physiology carries (rules.md §6). */
export const CONFIRM_INTERVENTIONS_REQUEST =
  'Major physiology (prolonged apnea, prolonged or critical hypoxemia): confirm that every intervention given is recorded above.';
