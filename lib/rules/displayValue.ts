import { MMHG_PER_KPA, type Channel, type SampleUnit } from '@/lib/domain/channel';
import type { ChannelTrace } from './coverage';
import { engineUnit } from './coverage';

/** The unit a case shows EtCO2 (and inspired CO2) in. */
export type Co2DisplayUnit = 'mmHg' | 'kPa';

function isCo2(channel: Channel): boolean {
  return channel === 'etco2' || channel === 'inspco2';
}

/** Rounded to 4 decimals: enough for kPa, and clears conversion noise (5.300000000000001). */
function round4(x: number): number {
  return Math.round(x * 1e4) / 1e4;
}

/**
 * An engine-unit value as the case shows it: CO2 in the case's display unit, others unchanged.
 *
 * @example
 * displayValue('etco2', 50, 'kPa')
 * //=> { value: 6.6661, unit: 'kPa' }
 */
export function displayValue(channel: Channel, engineValue: number, co2Unit: Co2DisplayUnit): { value: number; unit: SampleUnit } {
  if (!isCo2(channel)) return { value: engineValue, unit: engineUnit(channel) };
  return { value: co2Unit === 'kPa' ? round4(engineValue / MMHG_PER_KPA) : round4(engineValue), unit: co2Unit };
}

/**
 * Sample i of a trace as the case shows it; the recorded value itself when it arrived in the
 * display unit, so nothing is lost to a round trip.
 *
 * @example
 * sampleDisplayValue(kPaTrace, 0, 'kPa') // recorded 5.3 kPa
 * //=> { value: 5.3, unit: 'kPa' }
 */
export function sampleDisplayValue(trace: ChannelTrace, i: number, co2Unit: Co2DisplayUnit): { value: number; unit: SampleUnit } {
  if (!isCo2(trace.channel)) return { value: trace.raw[i], unit: trace.sourceUnit };
  if (trace.sourceUnit === co2Unit) return { value: trace.raw[i], unit: co2Unit };
  return displayValue(trace.channel, trace.v[i], co2Unit);
}
