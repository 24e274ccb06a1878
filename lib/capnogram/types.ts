/**
 * Types of the capnogram (raw CO2 waveform) analysis. All times are seconds from the case start
 * (the engine's clock); CO2 values are mmHg.
 */

/** One contiguous stretch of raw CO2 at a fixed rate. `NaN` marks a missing sample (a gap). */
export interface WaveformSegment {
  /** Time of sample 0, seconds from the case start. */
  t0S: number;
  /** Sampling rate, 20–300 Hz. */
  rateHz: number;
  /** CO2 in mmHg; NaN where no value was recorded. */
  v: ArrayLike<number>;
}

/** One breath: an expiration (phases II–III) and the inspiration that follows it. */
export interface Breath {
  /** Start of expiration: the foot of the upstroke (10 % of the amplitude above the inspired level). */
  expStartS: number;
  /** End of expiration: the end of the plateau, where the inspiratory downstroke starts. */
  expEndS: number;
  /** End-tidal CO2: the value at the end of the plateau (mmHg). */
  etco2: number;
  /** Peak CO2 during the expiration (mmHg). */
  peak: number;
  /** Inspired minimum CO2 during the following inspiration (mmHg); null when the record ends first. */
  inspMin: number | null;
  /** Inspired level before the breath, used as the baseline of its amplitude (mmHg). */
  baseline: number;
  expTimeS: number;
  /** Inspiratory time up to the next breath's expiration; null for the last breath of a stretch. */
  inspTimeS: number | null;
  /** 60 / (time to the next breath's start); null for the last breath of a stretch. */
  rrPerMin: number | null;
  /** Upstroke rise time from 10 % to 90 % of the amplitude (s). */
  riseTimeS: number;
  /** Phase-II slope: the steepest 0.1 s of the upstroke (mmHg/s). */
  upSlope: number;
  /** Phase-III slope: least-squares slope of the plateau (mmHg/s). */
  plateauSlope: number;
  /**
   * Angle between the phase-II and phase-III slopes (degrees), measured in a plot where one second of time is
   * drawn as long as the breath's amplitude (etco2 − baseline), so it does not depend on amplitude.
   */
  alphaDeg: number;
  /** Deepest dip within the plateau that recovers afterwards (mmHg). */
  notchDepth: number;
  /** Index of the contiguous stretch (segment without gaps) the breath belongs to. */
  stretch: number;
}

export const FINDING_KINDS = ['rebreathing', 'obstructive_upstroke', 'lost_plateau', 'plateau_notch', 'sudden_zero', 'low_amplitude'] as const;
export type FindingKind = (typeof FINDING_KINDS)[number];

export interface ShapeFinding {
  kind: FindingKind;
  /** Plateau's own short name. */
  label: string;
  /** What the shape looks like and what it commonly means, in words for the UI. */
  description: string;
  startS: number;
  endS: number;
  durationS: number;
  /** Indices into the breaths array the finding rests on (empty for a flat line). */
  breaths: number[];
  /** 0.5 at the threshold and the minimum breath count, rising to 1 with margin and length. */
  confidence: number;
  /** The measure that crossed the threshold: its worst value over the finding. */
  measure: { name: string; value: number; threshold: number; unit: string };
}

/** A stretch without usable samples (missing, non-numeric or absurd values). */
export interface WaveformGap {
  startS: number;
  endS: number;
}

export interface CapnogramAnalysis {
  breaths: Breath[];
  findings: ShapeFinding[];
  gaps: WaveformGap[];
  /** Breath amplitude the relative thresholds are measured against (median etco2 − baseline). */
  referenceAmplitude: number | null;
  /** Seconds of signal analysed (excluding gaps). */
  analysedS: number;
}
