/**
 * Physiological channels Plateau records, with their units and accepted input ranges.
 * Ranges are the input gate of rules.md §1: values outside are rejected, not clipped.
 */
export const CHANNELS = ['etco2', 'rr', 'spo2', 'hr', 'inspco2'] as const;
export type Channel = (typeof CHANNELS)[number];

export const SAMPLE_UNITS = ['mmHg', 'kPa', '%', '/min'] as const;
export type SampleUnit = (typeof SAMPLE_UNITS)[number];

export const SAMPLE_SOURCES = ['monitor', 'manual'] as const;
export type SampleSource = (typeof SAMPLE_SOURCES)[number];

export interface ChannelSpec {
  label: string;
  /** Units a series of this channel may arrive in; the first is the engine's unit. */
  units: readonly SampleUnit[];
  /** Accepted range in the engine's unit (inclusive). */
  min: number;
  max: number;
}

export const CHANNEL_SPECS: Record<Channel, ChannelSpec> = {
  etco2: { label: 'EtCO2', units: ['mmHg', 'kPa'], min: 0, max: 150 },
  inspco2: { label: 'Inspired CO2', units: ['mmHg', 'kPa'], min: 0, max: 150 },
  rr: { label: 'RR', units: ['/min'], min: 0, max: 80 },
  spo2: { label: 'SpO2', units: ['%'], min: 0, max: 100 },
  // HR range is Plateau's choice (rules.md names no range for HR): 0–300 /min.
  hr: { label: 'HR', units: ['/min'], min: 0, max: 300 },
};

/** 1 kPa in mmHg, from 760 mmHg = 101.325 kPa (references.md, Units). */
export const MMHG_PER_KPA = 760 / 101.325;
