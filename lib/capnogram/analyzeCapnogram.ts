import type { SampleSeries } from '@/lib/domain/caseRecord';
import { breathTrends } from './breathTrends';
import { segmentBreaths, type Pause, type SegmentBreathsOptions } from './segmentBreaths';
import { shapeFindings, type ShapeFindingOptions } from './shapeFindings';
import type { CapnogramAnalysis, WaveformSegment } from './types';

export type AnalyzeCapnogramOptions = SegmentBreathsOptions & ShapeFindingOptions;

export interface CapnogramResult extends CapnogramAnalysis {
  pauses: Pause[];
  /** Per-breath EtCO2, inspired CO2 and RR as monitor series for `analyzeCase`. */
  series: SampleSeries[];
}

/**
 * Breaths, shape findings and derived trends of a raw capnogram in one pass. Segments need not be
 * contiguous; the space between them and missing or absurd samples inside are gaps. Throws
 * RangeError for a rate outside 20–300 Hz; never throws for values.
 *
 * @example
 * const { segment } = generateCapnogram({ rateHz: 100, stretches: [{ durationS: 120, rrPerMin: 12 }] });
 * const r = analyzeCapnogram([segment]);
 * r.breaths.length   //=> 24
 * r.findings         //=> []
 * r.series[0].channel //=> 'etco2'
 */
export function analyzeCapnogram(segments: WaveformSegment[], options: AnalyzeCapnogramOptions = {}): CapnogramResult {
  const sorted = [...segments].sort((a, b) => a.t0S - b.t0S);
  const seg = segmentBreaths(sorted, options);
  for (let i = 1; i < sorted.length; i++) {
    const prevEnd = sorted[i - 1].t0S + sorted[i - 1].v.length / sorted[i - 1].rateHz;
    if (sorted[i].t0S > prevEnd + 1e-6) seg.gaps.push({ startS: prevEnd, endS: sorted[i].t0S });
  }
  seg.gaps.sort((a, b) => a.startS - b.startS);
  const { findings, referenceAmplitude } = shapeFindings(seg.breaths, seg.pauses, options);
  return { breaths: seg.breaths, findings, gaps: seg.gaps, pauses: seg.pauses, referenceAmplitude, analysedS: seg.analysedS, series: breathTrends(seg.breaths, seg.pauses, { pauseMinS: options.pauseMinS }) };
}
