import { MMHG_PER_KPA, type Channel } from '@/lib/domain/channel';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { AnalysisCore, CaseSummary, ExtremeValue, RuleSummary, SedationTime } from '@/lib/domain/episode';
import type { RuleSet } from '@/lib/domain/ruleSet';
import { firstSedativeDoseTime } from './baseline';
import { coverCase, type CoverageOptions, type TraceMap } from './coverage';
import { sampleDisplayValue, displayValue } from './displayValue';
import { intervalClip, intervalTotal } from './intervalSet';
import { majorPhysiology } from './levels';

export type SummarizeCaseOptions = CoverageOptions;

/** The rule whose episodes give `apneaResponseTimesS`. */
export const APNEA_RULE_ID = 'apnea';

function roundTo(x: number, decimals: number): number {
  const f = 10 ** decimals;
  return Math.round(x * f) / f;
}

/**
 * Lowest or highest reading of a channel over its observed monitor samples and its manual
 * readings (SpO2 0 and probe-off excluded); ties go to the earliest. Value in the display unit.
 */
function channelExtreme(record: CaseRecord, traces: TraceMap, channel: Channel, kind: 'lowest' | 'highest'): ExtremeValue | null {
  const co2Unit = record.case.etco2Unit;
  const sign = kind === 'lowest' ? 1 : -1;
  let bestEngine = Infinity; // sign × engine value of the best reading so far
  let best: ExtremeValue | null = null;
  const trace = traces[channel];
  if (trace !== undefined) {
    const i = kind === 'lowest' ? trace.minIndex : trace.maxIndex;
    if (i >= 0) {
      bestEngine = sign * trace.v[i];
      best = { value: sampleDisplayValue(trace, i, co2Unit).value, t: trace.t[i] };
    }
  }
  for (const s of record.series) {
    if (s.source !== 'manual' || s.channel !== channel) continue;
    const factor = s.unit === 'kPa' ? MMHG_PER_KPA : 1;
    const keepRaw = s.unit === co2Unit || (channel !== 'etco2' && channel !== 'inspco2');
    for (let i = 0; i < s.t.length; i++) {
      if (channel === 'spo2' && (s.v[i] === 0 || s.probeOff?.[i] === true)) continue;
      const engine = s.v[i] * factor;
      const score = sign * engine;
      if (score < bestEngine || (score === bestEngine && best !== null && s.t[i] < best.t)) {
        bestEngine = score;
        best = { value: keepRaw ? s.v[i] : displayValue(channel, engine, co2Unit).value, t: s.t[i] };
      }
    }
  }
  return best;
}

/**
 * Sedation time for capnography coverage (docs/rules.md): from the first `sedation_start` event,
 * else the first sedative dose; to the first `sedation_end` after it, else `recovery_start`, else
 * `procedure_end`, else the end of the last monitor sample's coverage. Null without a start, or
 * when the end is not after the start.
 *
 * @example
 * sedationTime(record, traces) // sedation_start at 140 s, sedation_end at 1800 s
 * //=> { start: 140, end: 1800, startFrom: 'sedation_start', endFrom: 'sedation_end' }
 */
export function sedationTime(record: CaseRecord, traces: TraceMap): SedationTime | null {
  const firstEvent = (kind: string, after: number) => {
    let best: number | null = null;
    for (const e of record.events) if (e.kind === kind && e.t > after && (best === null || e.t < best)) best = e.t;
    return best;
  };
  let start = firstEvent('sedation_start', -Infinity);
  let startFrom: SedationTime['startFrom'] = 'sedation_start';
  if (start === null) {
    start = firstSedativeDoseTime(record.doses);
    startFrom = 'first_sedative_dose';
  }
  if (start === null) return null;
  for (const kind of ['sedation_end', 'recovery_start', 'procedure_end'] as const) {
    const end = firstEvent(kind, start);
    if (end !== null) return { start, end, startFrom, endFrom: kind };
  }
  let end = -Infinity;
  for (const trace of Object.values(traces)) {
    const c = trace.covered;
    if (c.length > 0 && c[c.length - 1] > end) end = c[c.length - 1];
  }
  return end > start ? { start, end, startFrom, endFrom: 'end_of_monitoring' } : null;
}

/**
 * `summarizeCase` for callers that already covered the case's series (analyzeCase does).
 *
 * @example
 * summarizeWithTraces(record, PLATEAU_DEFAULT_V1, core, coverCase(record)).episodeCount
 * //=> 2
 */
export function summarizeWithTraces(record: CaseRecord, ruleSet: RuleSet, analysis: AnalysisCore, traces: TraceMap): CaseSummary {
  const rules: RuleSummary[] = ruleSet.rules.map((r) => ({ rule: r.id, episodeCount: 0, totalDurationS: 0 }));
  const byId = new Map(rules.map((r) => [r.rule, r]));
  for (const e of analysis.episodes) {
    const r = byId.get(e.rule);
    if (r === undefined) continue;
    r.episodeCount += 1;
    r.totalDurationS = roundTo(r.totalDurationS + e.durationS, 6);
  }
  const sed = sedationTime(record, traces);
  let coverage: number | null = null;
  if (sed !== null) {
    const capno = traces.etco2?.covered ?? [];
    coverage = roundTo((100 * intervalTotal(intervalClip(capno, sed.start, sed.end))) / (sed.end - sed.start), 1);
  }
  return {
    ruleSet: { id: ruleSet.id, version: ruleSet.version },
    rules,
    episodeCount: analysis.episodes.length,
    lowestSpo2: channelExtreme(record, traces, 'spo2', 'lowest'),
    highestEtco2: channelExtreme(record, traces, 'etco2', 'highest'),
    lowestEtco2: channelExtreme(record, traces, 'etco2', 'lowest'),
    etco2Unit: record.case.etco2Unit,
    lowestRr: channelExtreme(record, traces, 'rr', 'lowest'),
    sedationTime: sed,
    capnographyCoveragePct: coverage,
    caseLevel: analysis.caseLevel,
    majorPhysiology: majorPhysiology(analysis.episodes, ruleSet),
    apneaResponseTimesS: analysis.episodes.filter((e) => e.rule === APNEA_RULE_ID).map((e) => e.responseS),
  };
}

/**
 * The per-case summary stored with the rule-set version (one row per case per version): episode
 * count and total duration per rule, lowest SpO2, highest and lowest EtCO2, lowest RR (each with
 * its time), capnography coverage of the sedation time, case level, majorPhysiology, and the
 * response times of apnea episodes. `analyzeCase` returns it as `summary`.
 *
 * @example
 * summarizeCase(record, PLATEAU_DEFAULT_V1, analysis).lowestSpo2
 * //=> { value: 84, t: 655 }
 */
export function summarizeCase(record: CaseRecord, ruleSet: RuleSet, analysis: AnalysisCore, options?: SummarizeCaseOptions): CaseSummary {
  return summarizeWithTraces(record, ruleSet, analysis, coverCase(record, options));
}
