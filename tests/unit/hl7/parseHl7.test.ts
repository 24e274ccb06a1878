/**
 * Hand-written messages built from the HL7 v2.6 ORU^R01 structure as profiled by IHE PCD-01
 * (IHE PCD Technical Framework Vol. 2, PCD-01 "Communicate PCD Data": MSH-21 IHE_PCD_001,
 * PV1-3 point of care, OBR, OBX-3 with 11073 code^reference id^MDC, OBX-6 MDC units, OBX-14,
 * OBX-18 equipment EUI-64) — structure from memory of the profile.
 */
import { describe, expect, it } from 'vitest';
import { Hl7ParseError, parseHl7, buildAck, readAck, unescape } from '@/lib/ingest/hl7';

const MSH = 'MSH|^~\\&|MONITOR^ACDE48234567ABCD^EUI-64|KB-ICU|PLATEAU|PLATEAU|20260301091500+0100||ORU^R01^ORU_R01|MSG00001|P|2.6|||NE|AL||||||IHE_PCD_001^IHE PCD^1.3.6.1.4.1.19376.1.6.1.1.1^ISO';
const PID = 'PID|||12345^^^Hospital^MR||Doe^Jane';
const PV1 = 'PV1||I|KB-ROOM-1^^^KB';
const OBR = 'OBR|1|||182777000^monitoring of patient^SNOMED-CT|||20260301091500+0100';
const obx = (i: number, code: string, value: string, unit: string, ts = '20260301091500+0100', status = 'R') =>
  `OBX|${i}|NM|${code}|1.1.1.${i}|${value}|${unit}|||||${status}|||${ts}||||ACDE48234567ABCD^^ACDE48234567ABCD^EUI-64`;
const normal = [
  MSH,
  PID,
  PV1,
  OBR,
  obx(1, '151708^MDC_AWAY_CO2_ET^MDC', '38', '266016^MDC_DIM_MMHG^MDC'),
  obx(2, '151594^MDC_AWAY_RESP_RATE^MDC', '14', '264928^MDC_DIM_RESP_PER_MIN^MDC'),
  obx(3, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '97', '262688^MDC_DIM_PERCENT^MDC'),
  obx(4, '147842^MDC_ECG_HEART_RATE^MDC', '72', '264864^MDC_DIM_BEAT_PER_MIN^MDC'),
].join('\r');
const AT = Date.UTC(2026, 2, 1, 8, 15, 0);

function errorOf(text: string): Hl7ParseError {
  try {
    parseHl7(text);
  } catch (e) {
    if (e instanceof Hl7ParseError) return e;
    throw e;
  }
  throw new Error('expected a parse error');
}

describe('parseHl7', () => {
  it('reads a PCD-01 message: header, location and four samples at the OBX-14 instant in UTC', () => {
    const m = parseHl7(normal);
    expect(m.header).toMatchObject({ controlId: 'MSG00001', version: '2.6', sendingApp: 'MONITOR', sendingFacility: 'KB-ICU', messageType: 'ORU^R01' });
    expect(m.location).toBe('KB-ROOM-1');
    expect(m.patientId).toBe('12345');
    expect(m.equipmentId).toBe('ACDE48234567ABCD');
    expect(m.samples).toEqual([
      { channel: 'etco2', atMs: AT, value: 38, obx: 1 },
      { channel: 'rr', atMs: AT, value: 14, obx: 2 },
      { channel: 'spo2', atMs: AT, value: 97, obx: 3 },
      { channel: 'hr', atMs: AT, value: 72, obx: 4 },
    ]);
  });

  it('converts EtCO2 sent in kPa (UCUM) to mmHg: 5.0 kPa = 37.5 mmHg (1 kPa = 7.50062 mmHg, references.md)', () => {
    const m = parseHl7([MSH, PV1, obx(1, '151708^MDC_AWAY_CO2_ET^MDC', '5.0', 'kPa^kPa^UCUM')].join('\r'));
    expect(m.samples[0].value).toBeCloseTo(37.5, 1);
  });

  it('accepts UCUM spellings mm[Hg] and {beats}/min', () => {
    const m = parseHl7([MSH, PV1, obx(1, '151708^MDC_AWAY_CO2_ET^MDC', '40', 'mm[Hg]^mm[Hg]^UCUM'), obx(2, '149530^MDC_PULS_OXIM_PULS_RATE^MDC', '80', '{beats}/min^{beats}/min^UCUM')].join('\r'));
    expect(m.samples.map((s) => [s.channel, s.value])).toEqual([['etco2', 40], ['hr', 80]]);
  });

  it('decodes escape sequences \\F\\ \\S\\ \\T\\ \\R\\ \\E\\ in text fields', () => {
    const m = parseHl7([MSH, 'PV1||I|KB\\F\\ROOM\\S\\1\\T\\x\\R\\y\\E\\z^^^KB', obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '97', '%')].join('\r'));
    expect(m.location).toBe('KB|ROOM^1&x~y\\z');
    const d = parseHl7(normal).header.delimiters;
    expect(unescape('\\X41\\\\.br\\B', d)).toBe('A\nB');
  });

  it('takes OBR-7 when OBX-14 is missing, and MSH-7 when OBR-7 is missing too', () => {
    const noObx14 = [MSH, PV1, 'OBR|1|||x|||20260301091505+0100', obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '96', '%', '')].join('\r');
    expect(parseHl7(noObx14).samples[0].atMs).toBe(AT + 5000);
    expect(parseHl7(noObx14).observations[0].atFrom).toBe('OBR-7');
    const onlyMsh = [MSH, PV1, obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '96', '%', '')].join('\r');
    expect(parseHl7(onlyMsh).samples[0].atMs).toBe(AT);
  });

  it('reads a time with a negative zone and fractional seconds', () => {
    const m = parseHl7([MSH, PV1, obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '96', '%', '20260301041500.250-0500')].join('\r'));
    expect(m.samples[0].atMs).toBe(Date.UTC(2026, 2, 1, 9, 15, 0, 250));
  });

  it('accepts \\n and \\r\\n segment separators', () => {
    expect(parseHl7(normal.replace(/\r/g, '\n')).samples).toHaveLength(4);
    expect(parseHl7(normal.replace(/\r/g, '\r\n')).samples).toHaveLength(4);
  });

  it('keeps the first repetition of a repeated field and tolerates empty fields', () => {
    const m = parseHl7([MSH, 'PV1||I|KB-ROOM-2^^^KB~OTHER^^^KB||||||', obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '97', '%')].join('\r'));
    expect(m.location).toBe('KB-ROOM-2');
  });

  it('prefers airway RR over impedance RR and ECG HR over pulse rate at the same instant', () => {
    const m = parseHl7([
      MSH,
      PV1,
      obx(1, '151586^MDC_TTHOR_RESP_RATE^MDC', '18', '/min'),
      obx(2, '151594^MDC_AWAY_RESP_RATE^MDC', '12', '/min'),
      obx(3, '149530^MDC_PULS_OXIM_PULS_RATE^MDC', '70', '/min'),
      obx(4, '147842^MDC_ECG_HEART_RATE^MDC', '71', '/min'),
    ].join('\r'));
    expect(m.samples.map((s) => [s.channel, s.value])).toEqual([['rr', 12], ['hr', 71]]);
  });

  it('maps by MDC reference id when the numeric code is absent, and ignores codes it does not record', () => {
    const m = parseHl7([MSH, PV1, obx(1, '^MDC_CONC_AWAY_CO2_ET^MDC', '41', 'mmHg'), obx(2, '150021^MDC_PRESS_BLD_NONINV_DIA^MDC', '70', 'mmHg')].join('\r'));
    expect(m.samples).toEqual([expect.objectContaining({ channel: 'etco2', value: 41 })]);
    expect(m.ignored).toBe(1);
  });

  it('returns NA waveform observations without making samples of them', () => {
    const m = parseHl7([MSH, PV1, 'OBX|1|NA|151708^MDC_AWAY_CO2^MDC|1.1.1.9|0^1.5^20.2^38.1|266016^MDC_DIM_MMHG^MDC|||||R|||20260301091500+0100'].join('\r'));
    expect(m.waveforms[0].values).toEqual([0, 1.5, 20.2, 38.1]);
    expect(m.samples).toEqual([]);
  });

  it('skips an observation whose result status says it could not be obtained (X)', () => {
    const m = parseHl7([MSH, PV1, obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '', '%', undefined, 'X'), obx(2, '147842^MDC_ECG_HEART_RATE^MDC', '60', '/min')].join('\r'));
    expect(m.samples.map((s) => s.channel)).toEqual(['hr']);
  });

  describe('refuses, naming the segment and field', () => {
    it('a non-number value: OBX[3]-5', () => {
      const e = errorOf(normal.replace('|97|', '|9x7|'));
      expect(e.message).toBe('OBX[3]-5: not a number ("9x7")');
      expect([e.ack, e.code]).toEqual(['AE', 102]);
    });
    it('wrong delimiters: MSH-2 with repeated characters', () => {
      expect(errorOf(normal.replace('MSH|^~\\&|', 'MSH|^^\\&|')).message).toMatch(/^MSH-2: encoding characters/);
    });
    it('a field separator that is a letter: MSH-1', () => {
      expect(errorOf('MSHA^~\\&A').message).toMatch(/^MSH-1:/);
    });
    it('a truncated message (cut inside an OBX): OBX[4]-11 result status missing', () => {
      const cut = normal.slice(0, normal.lastIndexOf('|72|') + 4);
      expect(errorOf(cut).message).toBe('OBX[4]-11: result status is missing (required; is the message truncated?)');
    });
    it('a message cut after MSH: no OBX', () => {
      expect(errorOf(MSH).message).toMatch(/^OBX\[1\]: missing/);
    });
    it('not an ORU^R01: MSH-9 (AR 200)', () => {
      const e = errorOf(normal.replace('ORU^R01^ORU_R01', 'ADT^A01'));
      expect([e.message.slice(0, 6), e.ack, e.code]).toEqual(['MSH-9:', 'AR', 200]);
    });
    it('a missing control id: MSH-10', () => {
      expect(errorOf(normal.replace('|MSG00001|', '||')).message).toBe('MSH-10: message control id is missing');
    });
    it('an unsupported version: MSH-12', () => {
      expect(errorOf(normal.replace('|P|2.6|', '|P|3.0|')).message).toMatch(/^MSH-12: version 3.0/);
    });
    it('a unit that does not fit the code: OBX[1]-6', () => {
      expect(errorOf([MSH, PV1, obx(1, '151708^MDC_AWAY_CO2_ET^MDC', '38', '%')].join('\r')).message).toMatch(/^OBX\[1\]-6: unit % does not fit MDC_AWAY_CO2_ET/);
    });
    it('a value outside the channel range: OBX[1]-5', () => {
      expect(errorOf([MSH, PV1, obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '140', '%')].join('\r')).message).toMatch(/^OBX\[1\]-5: 140 % is outside/);
    });
    it('a bad OBX-14 time: OBX[1]-14', () => {
      expect(errorOf([MSH, PV1, obx(1, '150456^MDC_PULS_OXIM_SAT_O2^MDC', '97', '%', '20261399')].join('\r')).message).toMatch(/^OBX\[1\]-14:/);
    });
    it('text that does not start with MSH', () => {
      expect(errorOf('PID|1').message).toMatch(/^MSH: the message must start/);
    });
  });
});

describe('buildAck', () => {
  it('answers AA echoing the control id in MSA-2', () => {
    const a = buildAck('AA', { controlId: 'MSG00001', sendingApp: 'MONITOR', sendingFacility: 'KB-ICU', version: '2.6', at: new Date(AT), ackControlId: 'A1' });
    expect(a.split('\r')[0]).toBe('MSH|^~\\&|PLATEAU|PLATEAU|MONITOR|KB-ICU|20260301081500.000+0000||ACK^R01^ACK|A1|P|2.6');
    expect(readAck(a)).toMatchObject({ code: 'AA', controlId: 'MSG00001', err: null });
  });

  it('answers AE with an ERR segment naming OBX sequence 3 field 5 and HL7 table 0357 code 102', () => {
    const a = buildAck('AE', { controlId: 'X|1', at: new Date(AT), ackControlId: 'A2' }, { segment: 'OBX', occurrence: 3, field: 5, code: 102, text: 'OBX[3]-5: not a number ("9x7")' });
    const err = a.split('\r')[2].split('|');
    expect(err[0]).toBe('ERR');
    expect(err[1]).toBe('OBX^3^5^102&Data type error');
    expect(err[2]).toBe('OBX^3^5');
    expect(err[3]).toBe('102^Data type error^HL70357');
    expect(err[4]).toBe('E');
    expect(readAck(a).controlId).toBe('X\\F\\1');
  });
});
