import { medianOf } from '@/lib/_shared/sorted';
import type { CaseRecord } from '@/lib/domain/caseRecord';
import { MMHG_PER_KPA } from '@/lib/domain/channel';

/** A blood gas as entered, PaCO2 in mmHg (convert kPa at the edge with MMHG_PER_KPA). */
export interface BloodGasInput {
  id?: string;
  t: number;
  paco2MmHg: number;
  sampleType?: 'arterial' | 'venous' | 'capillary';
}

export interface Co2GapResult {
  id?: string;
  t: number;
  paco2MmHg: number;
  /** Median EtCO2 (mmHg) of the monitor samples in [t − halfWindowS, t + halfWindowS]; null when none. */
  etco2MmHg: number | null;
  samples: number;
  /** PaCO2 − EtCO2 in mmHg; null without EtCO2 — never invented. */
  gapMmHg: number | null;
  /** Change of the gap from the previous gas that had one. */
  changeMmHg: number | null;
  status: 'no_etco2' | 'within_usual' | 'wide' | 'negative';
  message: string;
}

/**
 * The usual arterial-to-end-tidal CO2 gap is a few mmHg (common practice, no single source);
 * Plateau marks more than 5 mmHg as wide. A widening gap points to more dead space or less
 * pulmonary perfusion.
 */
export const CO2_GAP_USUAL_MAX_MMHG = 5;
export const CO2_GAP_HALF_WINDOW_S = 30;

/**
 * Pairs each blood gas with the EtCO2 of the minute around it and gives the PaCO2 − EtCO2 gap,
 * in time order, with its trend.
 *
 * @example
 * co2Gaps(record, [{ t: 600, paco2MmHg: 45 }])[0].gapMmHg //=> 7 (EtCO2 38 around t = 600)
 */
export function co2Gaps(record: CaseRecord, gases: readonly BloodGasInput[], options: { halfWindowS?: number } = {}): Co2GapResult[] {
  const half = options.halfWindowS ?? CO2_GAP_HALF_WINDOW_S;
  const co2 = record.series.find((s) => s.channel === 'etco2' && s.source === 'monitor');
  const factor = co2?.unit === 'kPa' ? MMHG_PER_KPA : 1;
  let previous: number | null = null;
  return [...gases]
    .sort((a, b) => a.t - b.t)
    .map((g) => {
      const near: number[] = [];
      if (co2) for (let i = 0; i < co2.t.length; i++) if (co2.t[i] >= g.t - half && co2.t[i] <= g.t + half) near.push(co2.v[i] * factor);
      const et = near.length ? round1(medianOf(near)) : null;
      const gap = et === null ? null : round1(g.paco2MmHg - et);
      const change = gap !== null && previous !== null ? round1(gap - previous) : null;
      if (gap !== null) previous = gap;
      const status: Co2GapResult['status'] = gap === null ? 'no_etco2' : gap < 0 ? 'negative' : gap > CO2_GAP_USUAL_MAX_MMHG ? 'wide' : 'within_usual';
      const message =
        status === 'no_etco2'
          ? `No EtCO2 was recorded within ${half} s of this gas, so no gap is given.`
          : status === 'wide'
            ? `Gap ${gap} mmHg is wider than the usual few mmHg: consider more dead space or less pulmonary perfusion.`
            : status === 'negative'
              ? `EtCO2 is above PaCO2 (gap ${gap} mmHg): check the sample type, the timing and the EtCO2 reading.`
              : `Gap ${gap} mmHg is within the usual few mmHg.`;
      return { ...(g.id ? { id: g.id } : {}), t: g.t, paco2MmHg: g.paco2MmHg, etco2MmHg: et, samples: near.length, gapMmHg: gap, changeMmHg: change, status, message };
    });
}

/** kPa to mmHg for a blood-gas entry. @example paco2ToMmHg(6, 'kPa') //=> 45 */
export function paco2ToMmHg(value: number, unit: 'mmHg' | 'kPa'): number {
  return unit === 'kPa' ? round1(value * MMHG_PER_KPA) : value;
}


function round1(x: number): number {
  return Math.round(x * 10) / 10;
}
