/**
 * The one table of monitor observation codes and units Plateau reads from HL7 v2 OBX segments.
 *
 * Source: IEEE 11073-10101 nomenclature (MDC reference ids and numeric codes) as used by IHE PCD-01
 * and listed in the IHE PCD "Rosetta Terminology Mapping" (RTM) table. The numeric codes below were
 * written FROM MEMORY; no copy of the published 11073-10101 / Rosetta table was reachable from this
 * network. Cross-check done: 147842 (MDC_ECG_HEART_RATE), 150456 (MDC_PULS_OXIM_SAT_O2), 149530
 * (pulse rate), 151562 (MDC_RESP_RATE), 151708 (MDC_AWAY_CO2_ET) and the unit codes 266016 (mmHg),
 * 262688 (%), 264864 (beat/min), 264928 (resp/min) agree with an independent public code list
 * (a third-party HL7 tool on GitHub, not the standard itself). Codes marked `unverified` matched
 * nothing reachable. Because of that, matching accepts either the numeric code or the MDC reference
 * id (OBX-3.1 or OBX-3.2, or the alternate identifier in OBX-3.4/3.5): the reference ids are the
 * stable, human-readable part of the nomenclature and every PCD-01 sender we know of sends both.
 * UCUM units (OBX-6 with coding system UCUM) are accepted beside MDC units.
 */
import type { Channel } from '@/lib/domain/channel';

/** Where a rate or CO2 value was measured; used to prefer one source over another at one instant. */
export type ObservationSource = 'airway' | 'impedance' | 'ecg' | 'pulse-oximeter' | 'unspecified';

export interface ObservationCode {
  code: string;
  refId: string;
  channel: Channel;
  source: ObservationSource;
  /** Lower wins when two observations give the same channel at the same instant. */
  priority: number;
  /** true when the numeric code could not be checked against any table (see the module note). */
  unverified?: boolean;
  text: string;
}

export const OBSERVATION_CODES: readonly ObservationCode[] = [
  { code: '151708', refId: 'MDC_AWAY_CO2_ET', channel: 'etco2', source: 'airway', priority: 0, text: 'End-tidal CO2' },
  { code: '151708', refId: 'MDC_CONC_AWAY_CO2_ET', channel: 'etco2', source: 'airway', priority: 0, text: 'End-tidal CO2 (concentration form)' },
  { code: '151716', refId: 'MDC_CONC_AWAY_CO2_INSP', channel: 'inspco2', source: 'airway', priority: 1, unverified: true, text: 'Inspired CO2' },
  { code: '151718', refId: 'MDC_AWAY_CO2_INSP_MIN', channel: 'inspco2', source: 'airway', priority: 0, unverified: true, text: 'Minimum inspired CO2' },
  { code: '151594', refId: 'MDC_AWAY_RESP_RATE', channel: 'rr', source: 'airway', priority: 0, unverified: true, text: 'Respiratory rate (airway)' },
  { code: '151804', refId: 'MDC_CO2_RESP_RATE', channel: 'rr', source: 'airway', priority: 0, unverified: true, text: 'Respiratory rate (capnometer)' },
  { code: '151562', refId: 'MDC_RESP_RATE', channel: 'rr', source: 'unspecified', priority: 1, text: 'Respiratory rate' },
  { code: '151586', refId: 'MDC_TTHOR_RESP_RATE', channel: 'rr', source: 'impedance', priority: 2, unverified: true, text: 'Respiratory rate (transthoracic impedance)' },
  { code: '150456', refId: 'MDC_PULS_OXIM_SAT_O2', channel: 'spo2', source: 'pulse-oximeter', priority: 0, text: 'SpO2' },
  { code: '147842', refId: 'MDC_ECG_HEART_RATE', channel: 'hr', source: 'ecg', priority: 0, text: 'Heart rate (ECG)' },
  { code: '149530', refId: 'MDC_PULS_OXIM_PULS_RATE', channel: 'hr', source: 'pulse-oximeter', priority: 1, text: 'Pulse rate (oximeter)' },
  { code: '149514', refId: 'MDC_PULS_RATE', channel: 'hr', source: 'unspecified', priority: 2, unverified: true, text: 'Pulse rate' },
];

export type Hl7Unit = 'mmHg' | 'kPa' | '%' | '/min';

/** Accepted spellings (MDC numeric code, MDC reference id, UCUM, common text) per unit. */
export const UNIT_SPELLINGS: Record<Hl7Unit, readonly string[]> = {
  mmHg: ['266016', 'MDC_DIM_MMHG', 'mm[Hg]', 'mmHg'],
  kPa: ['MDC_DIM_KILO_PASCAL', 'kPa'],
  '%': ['262688', 'MDC_DIM_PERCENT', '%'],
  '/min': ['264864', 'MDC_DIM_BEAT_PER_MIN', '264928', 'MDC_DIM_RESP_PER_MIN', '/min', '1/min', '{beats}/min', '{beat}/min', '{breaths}/min', '{breath}/min', '{resp}/min', 'bpm', 'rpm'],
};

/** The unit each channel is stored in, and the units it may arrive in. */
export const CHANNEL_UNITS: Record<Channel, readonly Hl7Unit[]> = {
  etco2: ['mmHg', 'kPa'],
  inspco2: ['mmHg', 'kPa'],
  rr: ['/min'],
  spo2: ['%'],
  hr: ['/min'],
};

/** 1 kPa = 7.50062 mmHg (760 mmHg = 101.325 kPa). */
export const MMHG_PER_KPA = 7.50062;

const byCode = new Map<string, ObservationCode>();
const byRef = new Map<string, ObservationCode>();
for (const c of OBSERVATION_CODES) {
  if (!byCode.has(c.code)) byCode.set(c.code, c);
  byRef.set(c.refId.toUpperCase(), c);
}

/**
 * The observation an OBX-3 names, by MDC reference id first (robust to a wrong numeric code in
 * this table), then by numeric code; null when Plateau does not record it.
 * @example lookupObservation(['150456', 'MDC_PULS_OXIM_SAT_O2', 'MDC'])?.channel //=> 'spo2'
 */
export function lookupObservation(components: readonly string[]): ObservationCode | null {
  const ids = [components[0], components[1], components[3], components[4]].filter((x): x is string => !!x);
  for (const id of ids) {
    const r = byRef.get(id.trim().toUpperCase());
    if (r) return r;
  }
  const systems = [components[2], components[5]];
  for (const [i, id] of [components[0], components[3]].entries()) {
    if (!id) continue;
    const sys = (systems[i] ?? '').toUpperCase();
    if (sys === '' || sys === 'MDC' || sys.startsWith('MDC')) {
      const r = byCode.get(id.trim());
      if (r) return r;
    }
  }
  return null;
}

const unitLookup = new Map<string, Hl7Unit>();
for (const [u, names] of Object.entries(UNIT_SPELLINGS) as [Hl7Unit, readonly string[]][]) for (const n of names) unitLookup.set(n.toLowerCase(), u);

/**
 * The unit an OBX-6 names (any of its identifier components), or null.
 * @example lookupUnit(['266016', 'MDC_DIM_MMHG', 'MDC']) //=> 'mmHg'
 */
export function lookupUnit(components: readonly string[]): Hl7Unit | null {
  for (const c of [components[0], components[1], components[3], components[4]]) {
    if (!c) continue;
    const u = unitLookup.get(c.trim().toLowerCase());
    if (u) return u;
  }
  return null;
}
