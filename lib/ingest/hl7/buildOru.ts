/**
 * ORU^R01 messages in the IHE PCD-01 shape (MSH, PID, PV1, OBR, one OBX per observation with an
 * 11073 code, MDC unit, OBX-14 time and OBX-18 equipment id), for the simulator, tests and bench.
 */
import { OBSERVATION_CODES } from './codes';
import { hl7Ts } from './buildAck';
import type { Channel } from '@/lib/domain/channel';

export interface OruInput {
  controlId: string;
  at: Date;
  sendingApp?: string;
  sendingFacility?: string;
  /** MSH-8, the per-device key, when the device authenticates by key. */
  deviceKey?: string;
  location: string;
  equipmentId?: string;
  patientId?: string;
  values: Partial<Record<Channel, number>>;
  /** Send EtCO2 in kPa instead of mmHg. */
  kPa?: boolean;
}

const REF: Record<Channel, string> = { etco2: 'MDC_AWAY_CO2_ET', rr: 'MDC_AWAY_RESP_RATE', spo2: 'MDC_PULS_OXIM_SAT_O2', hr: 'MDC_ECG_HEART_RATE', inspco2: 'MDC_AWAY_CO2_INSP_MIN' };
const UNIT: Record<Channel, string> = { etco2: '266016^MDC_DIM_MMHG^MDC', inspco2: '266016^MDC_DIM_MMHG^MDC', rr: '264928^MDC_DIM_RESP_PER_MIN^MDC', spo2: '262688^MDC_DIM_PERCENT^MDC', hr: '264864^MDC_DIM_BEAT_PER_MIN^MDC' };

/**
 * @example buildOru({ controlId: '1', at: new Date(0), location: 'R1', values: { spo2: 97 } }).split('\r')[4].split('|')[5] //=> '97'
 */
export function buildOru(m: OruInput): string {
  const ts = hl7Ts(m.at);
  const eq = m.equipmentId ?? 'SIM-MONITOR';
  const segs = [
    ['MSH', '^~\\&', m.sendingApp ?? 'PLATEAU-SIM', m.sendingFacility ?? 'SIM', 'PLATEAU', 'PLATEAU', ts, m.deviceKey ?? '', 'ORU^R01^ORU_R01', m.controlId, 'P', '2.6', '', '', 'NE', 'AL', '', '', '', '', 'IHE_PCD_001^IHE PCD^1.3.6.1.4.1.19376.1.6.1.1.1^ISO'].join('|'),
    ['PID', '', '', m.patientId ?? '', '', ''].join('|'),
    ['PV1', '', 'I', `${m.location}^^^PLATEAU`].join('|'),
    ['OBR', '1', '', '', '182777000^monitoring of patient^SNOMED-CT', '', '', ts].join('|'),
  ];
  let i = 0;
  for (const ch of Object.keys(m.values) as Channel[]) {
    const v = m.values[ch];
    if (v === undefined) continue;
    i++;
    const code = OBSERVATION_CODES.find((c) => c.refId === REF[ch])!.code;
    const kpa = m.kPa && (ch === 'etco2' || ch === 'inspco2');
    const value = kpa ? String(Math.round((v / 7.50062) * 100) / 100) : String(v);
    segs.push(['OBX', String(i), 'NM', `${code}^${REF[ch]}^MDC`, `1.1.1.${i}`, value, kpa ? 'kPa^kPa^UCUM' : UNIT[ch], '', '', '', '', 'R', '', '', ts, '', '', '', `${eq}^^${eq}^EUI-64`].join('|'));
  }
  return segs.join('\r') + '\r';
}
