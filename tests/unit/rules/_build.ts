/** Small builders for rules tests: traces written as runs of values, cases with defaults. */
import type { Channel, SampleUnit } from '@/lib/domain/channel';
import type { CaseRecord, DoseEntry, InterventionEntry, SampleSeries, CaseEventEntry } from '@/lib/domain/caseRecord';
import type { Rule, RuleSet } from '@/lib/domain/ruleSet';

/** `runs([38, 100], [0, 20])` → 100 × 38 then 20 × 0. */
export function runs(...parts: [value: number, count: number][]): number[] {
  const out: number[] = [];
  for (const [v, n] of parts) for (let i = 0; i < n; i++) out.push(v);
  return out;
}

const UNIT: Record<Channel, SampleUnit> = { etco2: 'mmHg', inspco2: 'mmHg', rr: '/min', spo2: '%', hr: '/min' };

/** A monitor series sampled every `dt` s from `t0`. */
export function monitor(channel: Channel, v: number[], opts: { t0?: number; dt?: number; unit?: SampleUnit; probeOff?: boolean[] } = {}): SampleSeries {
  const t0 = opts.t0 ?? 0;
  const dt = opts.dt ?? 1;
  const s: SampleSeries = { channel, unit: opts.unit ?? UNIT[channel], source: 'monitor', t: v.map((_, i) => t0 + i * dt), v };
  if (opts.probeOff) s.probeOff = opts.probeOff;
  return s;
}

/** A monitor series at explicit times. */
export function monitorAt(channel: Channel, t: number[], v: number[], unit?: SampleUnit): SampleSeries {
  return { channel, unit: unit ?? UNIT[channel], source: 'monitor', t, v };
}

/** A manual (spot) series. */
export function manual(channel: Channel, t: number[], v: number[], unit?: SampleUnit): SampleSeries {
  return { channel, unit: unit ?? UNIT[channel], source: 'manual', t, v };
}

export function caseOf(
  series: SampleSeries[],
  extra: { doses?: DoseEntry[]; interventions?: InterventionEntry[]; events?: CaseEventEntry[]; etco2Unit?: 'mmHg' | 'kPa' } = {},
): CaseRecord {
  return {
    case: { start: '2026-03-02T09:00:00Z', etco2Unit: extra.etco2Unit ?? 'mmHg' },
    series,
    doses: extra.doses ?? [],
    interventions: extra.interventions ?? [],
    events: extra.events ?? [],
  };
}

export const propofolAt = (t: number): DoseEntry => ({ t, drug: 'propofol', amount: 40, unit: 'mg', route: 'IV' });

/** A one-rule rule set. */
export function oneRule(rule: Omit<Rule, 'description' | 'source'> & Partial<Pick<Rule, 'description' | 'source'>>): RuleSet {
  return { id: 'test', version: 1, description: 'test', rules: [{ description: 'test rule', source: 'test', ...rule }] };
}
