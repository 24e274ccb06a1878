import type { Channel } from '@/lib/domain/channel';
import type { DoseEntry, InterventionEntry } from '@/lib/domain/caseRecord';
import { isSedativeDrug } from '@/lib/domain/drug';
import type { Episode, EpisodeExtreme, LinkedIntervention } from '@/lib/domain/episode';
import { INTERVENTION_LEVEL } from '@/lib/domain/intervention';
import type { Rule } from '@/lib/domain/ruleSet';
import type { ResolvedRule } from './conditions';
import { coverEndAt, isObserved, type ChannelTrace, type TraceMap } from './coverage';
import type { EpisodeBounds } from './detectEpisodes';
import { sampleDisplayValue, type Co2DisplayUnit } from './displayValue';
import { episodeLevel } from './levels';

/** Interventions up to this long after an episode's end are linked to it (rules.md §5). */
export const RESPONSE_WINDOW_S = 60;
/** Abrupt apnea onset: EtCO2 fell from ≥ 25 mmHg to < 5 mmHg within 5 s (rules.md §5). */
export const ABRUPT_FROM_MMHG = 25;
export const ABRUPT_TO_MMHG = 5;
export const ABRUPT_WITHIN_S = 5;

/** What the facts of every episode of a case are drawn from; built once per case. */
export interface EpisodeContext {
  traces: TraceMap;
  /** Sedative and opioid doses sorted by time. */
  sedativeDoses: DoseEntry[];
  /** All interventions sorted by time. */
  interventions: InterventionEntry[];
  co2Unit: Co2DisplayUnit;
  responseWindowS?: number;
}

/**
 * Build the context once per case: sedative doses (sedatives and opioids, `isSedativeDrug`) and
 * interventions sorted by time.
 *
 * @example
 * episodeContext(record, coverCase(record)).sedativeDoses.map((d) => d.drug)
 * //=> ['fentanyl', 'propofol']
 */
export function episodeContext(
  record: { doses: DoseEntry[]; interventions: InterventionEntry[]; case: { etco2Unit: Co2DisplayUnit } },
  traces: TraceMap,
  responseWindowS = RESPONSE_WINDOW_S,
): EpisodeContext {
  return {
    traces,
    sedativeDoses: record.doses.filter((d) => isSedativeDrug(d.drug, d.drugClass)).sort((a, b) => a.t - b.t),
    interventions: record.interventions.slice().sort((a, b) => a.t - b.t || a.kind.localeCompare(b.kind)),
    co2Unit: record.case.etco2Unit,
    responseWindowS,
  };
}

/** First sample index whose coverage reaches past `start` (t[i] ≥ start, or the one covering it). */
function firstSampleFrom(trace: ChannelTrace, start: number): number {
  const t = trace.t;
  let lo = 0;
  let hi = t.length;
  while (lo < hi) {
    const mid = (lo + hi) >> 1;
    if (t[mid] < start) lo = mid + 1;
    else hi = mid;
  }
  if (lo > 0 && coverEndAt(trace, lo - 1) > start) lo -= 1;
  return lo;
}

/**
 * True for an apnea-type rule, whose episodes get `onsetAbrupt`: an absolute EtCO2 term `<`,
 * `<=` or `=` at ≤ 5 mmHg.
 *
 * @example
 * isApneaTypeRule(PLATEAU_DEFAULT_V1.rules[0]) // apnea: EtCO2 < 5 OR RR = 0
 * //=> true
 */
export function isApneaTypeRule(rule: Rule): boolean {
  return rule.terms.some(
    (x) => x.channel === 'etco2' && x.relativeTo === undefined && (x.comparator === '<' || x.comparator === '<=' || x.comparator === '=') && x.threshold <= ABRUPT_TO_MMHG,
  );
}

/**
 * The directions to report per channel: for an `any` rule every direction among its terms on
 * the channel, for an `all` rule the direction of its first term there.
 */
function extremeKinds(resolved: ResolvedRule): { channel: Channel; kind: 'lowest' | 'highest' }[] {
  const out: { channel: Channel; kind: 'lowest' | 'highest' }[] = [];
  for (const term of resolved.terms) {
    const kind = term.comparator === '>' || term.comparator === '>=' ? 'highest' : 'lowest';
    const sameChannel = out.filter((x) => x.channel === term.channel);
    if (sameChannel.length > 0 && (resolved.rule.combine === 'all' || sameChannel.some((x) => x.kind === kind))) continue;
    out.push({ channel: term.channel, kind });
  }
  return out;
}

function extremeIn(trace: ChannelTrace, start: number, end: number, kind: 'lowest' | 'highest', co2Unit: Co2DisplayUnit): EpisodeExtreme | null {
  const { t, v } = trace;
  let best = -1;
  for (let i = firstSampleFrom(trace, start); i < t.length && t[i] < end; i++) {
    if (!(coverEndAt(trace, i) > t[i])) continue;
    if (best < 0 || (kind === 'lowest' ? v[i] < v[best] : v[i] > v[best])) best = i;
  }
  if (best < 0) return null;
  return { channel: trace.channel, kind, ...sampleDisplayValue(trace, best, co2Unit), t: t[best] };
}

/**
 * onsetAbrupt (rules.md §5): the first EtCO2 sample below 5 mmHg inside the episode was preceded,
 * within 5 s, by a sample of at least 25 mmHg.
 */
function abruptOnset(trace: ChannelTrace | undefined, start: number, end: number): boolean {
  if (trace === undefined) return false;
  const { t, v } = trace;
  let low = -1;
  for (let i = firstSampleFrom(trace, start); i < t.length && t[i] < end; i++) {
    if (t[i] >= start && isObserved(trace, i) && v[i] < ABRUPT_TO_MMHG) {
      low = i;
      break;
    }
  }
  if (low < 0) return false;
  for (let k = low - 1; k >= 0 && t[k] >= t[low] - ABRUPT_WITHIN_S; k--) {
    if (v[k] >= ABRUPT_FROM_MMHG) return true;
  }
  return false;
}

function roundS(x: number): number {
  return Math.round(x * 1e6) / 1e6;
}

/**
 * The facts of one episode (rules.md §5): extreme values, abrupt onset for apnea-type rules, the
 * last sedative dose before start, the interventions in [start, end + 60 s], the response time and
 * the level (rules.md §6).
 *
 * @example
 * episodeFacts({ start: 600, end: 640, censoredStart: false, censoredEnd: false }, apnea, ctx).responseS
 * //=> 15 // jaw thrust at 615 s
 */
export function episodeFacts(bounds: EpisodeBounds, resolved: ResolvedRule, ctx: EpisodeContext): Episode {
  const { start, end } = bounds;
  const extremes: EpisodeExtreme[] = [];
  for (const { channel, kind } of extremeKinds(resolved)) {
    const trace = ctx.traces[channel];
    const x = trace === undefined ? null : extremeIn(trace, start, end, kind, ctx.co2Unit);
    if (x !== null) extremes.push(x);
  }

  let dose: DoseEntry | null = null;
  for (const d of ctx.sedativeDoses) {
    if (d.t < start) dose = d;
    else break;
  }

  const until = end + (ctx.responseWindowS ?? RESPONSE_WINDOW_S);
  const interventions: LinkedIntervention[] = [];
  for (const iv of ctx.interventions) {
    if (iv.t > until) break;
    if (iv.t >= start) interventions.push({ t: iv.t, kind: iv.kind, level: INTERVENTION_LEVEL[iv.kind] });
  }

  const censoredAt = bounds.censoredStart ? (bounds.censoredEnd ? 'both' : 'start') : bounds.censoredEnd ? 'end' : null;
  return {
    rule: resolved.rule.id,
    start,
    end,
    durationS: roundS(end - start),
    censored: censoredAt !== null,
    censoredAt,
    extremes,
    onsetAbrupt: isApneaTypeRule(resolved.rule) ? abruptOnset(ctx.traces.etco2, start, end) : null,
    lastSedativeDose: dose === null ? null : { t: dose.t, drug: dose.drug, amount: dose.amount, unit: dose.unit, route: dose.route },
    sinceLastSedativeDoseS: dose === null ? null : roundS(start - dose.t),
    interventions,
    responseS: interventions.length === 0 ? null : roundS(interventions[0].t - start),
    level: episodeLevel(interventions),
  };
}
