import { MMHG_PER_KPA } from '@/lib/domain/channel';
import type { SampleSeries } from '@/lib/domain/caseRecord';
import type { SpotFinding } from '@/lib/domain/episode';
import { compareValue, type ConditionCache, type ResolvedRule } from './conditions';
import { displayValue, type Co2DisplayUnit } from './displayValue';
import { intervalContains } from './intervalSet';

/**
 * Spot findings (rules.md §1): manual readings never make an episode; a manual value past a
 * rule's threshold is reported with its time, channel, value and rule. A reading meets an `any`
 * rule when one of the rule's terms on its channel holds; an `all` rule when every term on its
 * channel holds and the rule's terms on other channels hold at that instant on their monitor
 * series. Manual SpO2 of 0 or marked probe-off is unobserved, as on a monitor. A manual RR of 0
 * meets `RR = 0`. Sorted by time, then rule id.
 *
 * @example
 * findSpotFindings([{ channel: 'spo2', unit: '%', source: 'manual', t: [300], v: [88] }], rules, cache, 'mmHg')
 * //=> [{ rule: 'hypoxemia', channel: 'spo2', t: 300, value: 88, unit: '%' }, { rule: 'prolonged_hypoxemia', … }]
 */
export function findSpotFindings(
  series: readonly SampleSeries[],
  rules: readonly ResolvedRule[],
  cache: ConditionCache,
  co2Unit: Co2DisplayUnit,
): SpotFinding[] {
  const out: SpotFinding[] = [];
  for (const s of series) {
    if (s.source !== 'manual') continue;
    const factor = s.unit === 'kPa' ? MMHG_PER_KPA : 1;
    const isCo2 = s.channel === 'etco2' || s.channel === 'inspco2';
    for (const resolved of rules) {
      if (!resolved.runs) continue;
      const own = resolved.terms.filter((x) => x.channel === s.channel);
      if (own.length === 0) continue;
      const others = resolved.terms.filter((x) => x.channel !== s.channel);
      for (let i = 0; i < s.t.length; i++) {
        const raw = s.v[i];
        if (s.channel === 'spo2' && (raw === 0 || s.probeOff?.[i] === true)) continue;
        const x = raw * factor;
        const t = s.t[i];
        let hit: boolean;
        if (resolved.rule.combine === 'any') {
          hit = own.some((term) => compareValue(x, term.comparator, term.threshold));
        } else {
          hit =
            own.every((term) => compareValue(x, term.comparator, term.threshold)) &&
            others.every((term) => intervalContains(cache.term(term.channel, term.comparator, term.threshold), t));
        }
        if (!hit) continue;
        // the recorded value itself unless a CO2 reading must be converted to the display unit
        const shown = !isCo2 || s.unit === co2Unit ? { value: raw, unit: s.unit } : displayValue(s.channel, x, co2Unit);
        out.push({ rule: resolved.rule.id, channel: s.channel, t, ...shown });
      }
    }
  }
  out.sort((a, b) => a.t - b.t || (a.rule < b.rule ? -1 : a.rule > b.rule ? 1 : 0) || (a.channel < b.channel ? -1 : a.channel > b.channel ? 1 : 0));
  return out;
}
