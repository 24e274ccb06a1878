/** Raw capnogram analysis (pure): breaths, shape findings, derived trends, CSV reading, a synthetic generator. */
export * from './types';
export { analyzeCapnogram, type AnalyzeCapnogramOptions, type CapnogramResult } from './analyzeCapnogram';
export { segmentBreaths, SEGMENT_DEFAULTS, type Pause, type Segmentation, type SegmentBreathsOptions } from './segmentBreaths';
export { shapeFindings, FINDING_DEFAULTS, FINDING_TEXT, type ShapeFindingOptions } from './shapeFindings';
export { breathTrends, type BreathTrendOptions } from './breathTrends';
export { parseWaveformCsv, WaveformError, type ParsedWaveform, type ParseWaveformCsvOptions } from './parseWaveformCsv';
export { generateCapnogram, NORMAL_BREATH, type BreathShape, type GenerateCapnogramOptions, type TrueBreath } from './generateCapnogram';
export { downsampleMinMax } from './downsampleMinMax';
