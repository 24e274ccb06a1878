import type { CaseRecord } from '@/lib/domain/caseRecord';
import type { Analysis } from '@/lib/domain/episode';
import { displayValue } from '@/lib/rules/displayValue';
import { MMHG_PER_KPA } from '@/lib/domain/channel';
import { drugInfo } from './drugTotals';
import { formatDoseAmount } from './format';
import { ruleLabel } from './labels';
import type { ChartData, ChartSeries, NoteFacts } from './types';

export interface ChartDataOptions {
  /** Seconds drawn before the sedation start and after its end; default 120. */
  padS?: number;
  maxHoldS?: number;
}

/**
 * The chart of the PDF from a case: the monitor series of EtCO2 (in the case's display unit), RR,
 * SpO2 (probe off and 0 as null) and HR, the episodes and the doses, over the sedation time
 * padded by `padS` (the whole record when there is no sedation time).
 *
 * @example
 * chartDataFromCase(record, analysis, facts).series.map((s) => s.channel)
 * //=> ['etco2', 'spo2', 'rr']
 */
export function chartDataFromCase(record: CaseRecord, analysis: Analysis, facts: Pick<NoteFacts, 'drugs'>, options?: ChartDataOptions): ChartData {
  const co2Unit = record.case.etco2Unit;
  const series: ChartSeries[] = [];
  let first = Infinity;
  let last = -Infinity;
  for (const s of record.series) {
    if (s.source !== 'monitor' || s.t.length === 0) continue;
    if (s.channel !== 'etco2' && s.channel !== 'rr' && s.channel !== 'spo2' && s.channel !== 'hr') continue;
    if (series.some((x) => x.channel === s.channel)) continue;
    first = Math.min(first, s.t[0]);
    last = Math.max(last, s.t[s.t.length - 1]);
    let v: (number | null)[];
    let unit = s.unit;
    if (s.channel === 'etco2') {
      unit = co2Unit;
      v = s.unit === co2Unit ? s.v.slice() : s.v.map((x) => displayValue('etco2', s.unit === 'kPa' ? x * MMHG_PER_KPA : x, co2Unit).value);
    } else if (s.channel === 'spo2') {
      v = s.v.map((x, i) => (x === 0 || s.probeOff?.[i] === true ? null : x));
    } else {
      v = s.v.slice();
    }
    series.push({ channel: s.channel, unit, t: s.t.slice(), v });
  }
  const sed = analysis.summary.sedationTime;
  const pad = options?.padS ?? 120;
  let window: ChartData['window'];
  if (sed !== null) window = { start: Math.max(sed.start - pad, Math.min(first, sed.start)), end: Math.min(sed.end + pad, Math.max(last, sed.end)) };
  else if (first < last) window = { start: first, end: last };
  return {
    ...(window !== undefined ? { window } : {}),
    etco2Unit: co2Unit,
    ...(options?.maxHoldS !== undefined ? { maxHoldS: options.maxHoldS } : {}),
    series,
    episodes: analysis.episodes.map((e) => ({ rule: e.rule, label: ruleLabel(e.rule), start: e.start, end: e.end })),
    doses: [...record.doses].sort((a, b) => a.t - b.t).map((d) => ({ t: d.t, label: `${drugInfo(d.drug, facts, d.drugClass).label} ${formatDoseAmount(d.amount, d.unit)}` })),
  };
}
