/**
 * HL7 v2 ORU^R01 parsing (as profiled by IHE PCD-01) into a typed message or a typed error that
 * names the segment and field at fault, e.g. `OBX[3]-5: not a number`. Pure: time comes in as
 * options; nothing is read from the environment.
 *
 * Segments end with \r (the standard), \n or \r\n (accepted: interface engines and files vary).
 * Delimiters come from MSH-1/MSH-2. Escape sequences \F\ \S\ \T\ \R\ \E\ (and \Xhh\, \.br\) are
 * decoded per component after splitting. Repeated fields (~) are kept as repetitions; the first
 * repetition is what Plateau reads for single-valued fields.
 */
import { CHANNEL_SPECS, type Channel } from '@/lib/domain/channel';
import { CHANNEL_UNITS, MMHG_PER_KPA, lookupObservation, lookupUnit, type Hl7Unit, type ObservationSource } from './codes';

export interface Delimiters {
  field: string;
  component: string;
  repetition: string;
  escape: string;
  subcomponent: string;
}

/** HL7 table 0357 codes Plateau uses in ERR-3. */
export type Hl7ErrorCode = 100 | 101 | 102 | 103 | 200 | 203 | 204 | 207;

/** Where a message is wrong: segment id, its occurrence (1-based), field number, and why. */
export class Hl7ParseError extends Error {
  constructor(
    public readonly segment: string,
    public readonly occurrence: number,
    public readonly field: number | null,
    public readonly reason: string,
    public readonly code: Hl7ErrorCode,
    /** AR (reject: the message as a whole cannot be taken) or AE (error in its content). */
    public readonly ack: 'AR' | 'AE',
  ) {
    super(`${segment}${occurrence > 1 || segment === 'OBX' ? `[${occurrence}]` : ''}${field === null ? '' : `-${field}`}: ${reason}`);
    this.name = 'Hl7ParseError';
  }
}

export interface Hl7Header {
  delimiters: Delimiters;
  sendingApp: string | null;
  sendingFacility: string | null;
  receivingApp: string | null;
  receivingFacility: string | null;
  /** MSH-7 as epoch ms, when present and valid. */
  messageAtMs: number | null;
  /** MSH-8: Plateau reads a per-device key here. */
  security: string | null;
  messageType: string;
  controlId: string;
  processingId: string | null;
  version: string;
}

export interface Hl7Observation {
  /** 1-based occurrence of the OBX segment in the message. */
  obx: number;
  valueType: string;
  code: string;
  text: string;
  codingSystem: string;
  subId: string | null;
  /** The channel Plateau records it as, when it is one of the mapped codes. */
  channel: Channel | null;
  source: ObservationSource | null;
  priority: number;
  /** NM: the number as sent; null for other types or an empty value. */
  value: number | null;
  /** NA: the waveform's numbers (storage is a separate concern). */
  values: number[] | null;
  unit: Hl7Unit | null;
  unitText: string;
  resultStatus: string;
  /** OBX-14, else OBR-7, else MSH-7, as epoch ms. */
  atMs: number | null;
  atFrom: 'OBX-14' | 'OBR-7' | 'MSH-7' | null;
  equipmentId: string | null;
}

export interface Hl7Sample {
  channel: Channel;
  atMs: number;
  /** In Plateau's unit for the channel (EtCO2 and inspired CO2 in mmHg). */
  value: number;
  obx: number;
}

export interface Hl7Message {
  header: Hl7Header;
  patientId: string | null;
  /** PV1-3 point of care (component 1), e.g. 'KB-ROOM-1'. */
  location: string | null;
  /** PV1-3 as sent, all components joined by '^'. */
  locationFull: string | null;
  observations: Hl7Observation[];
  /** NM observations of mapped channels, converted and de-duplicated by channel and time. */
  samples: Hl7Sample[];
  /** Waveform (NA) observations. */
  waveforms: Hl7Observation[];
  /** First equipment id seen (OBX-18), if any. */
  equipmentId: string | null;
  ignored: number;
}

export interface ParseHl7Options {
  /** Offset (minutes east of UTC) for timestamps that carry no zone; default 0 (UTC). */
  defaultZoneOffsetMinutes?: number;
  /** Versions accepted in MSH-12 (prefix match); default 2.3–2.9. */
  versions?: readonly string[];
}

const DEFAULT_VERSIONS = ['2.3', '2.4', '2.5', '2.6', '2.7', '2.8', '2.9'];

/**
 * Parses one HL7 v2 ORU^R01 message; throws Hl7ParseError naming the segment and field.
 * @example parseHl7('MSH|^~\\&|MON|ICU|||20260101120000+0000||ORU^R01|1|P|2.6\rOBX|1|NM|150456^MDC_PULS_OXIM_SAT_O2^MDC||97|262688^MDC_DIM_PERCENT^MDC|||||R').samples[0].value //=> 97
 */
export function parseHl7(text: string, options: ParseHl7Options = {}): Hl7Message {
  const t = text.replace(/^\uFEFF/, '');
  if (!t.startsWith('MSH')) throw new Hl7ParseError('MSH', 1, null, 'the message must start with an MSH segment', 100, 'AR');
  if (t.length < 8) throw new Hl7ParseError('MSH', 1, 2, 'truncated before the encoding characters', 101, 'AR');
  const d = delimitersOf(t);
  const lines = t.split(/\r\n|\r|\n/).filter((l) => l.length > 0);
  const segs = lines.map((l, i) => {
    const id = l.slice(0, 3);
    if (!/^[A-Z][A-Z0-9]{2}$/.test(id) || (l.length > 3 && l[3] !== d.field)) throw new Hl7ParseError(`segment ${i + 1}`, 1, null, `"${clip(l)}" is not a segment (a segment id is 3 capitals or digits followed by "${d.field}")`, 100, 'AE');
    return { id, fields: l.split(d.field) };
  });
  if (segs.filter((s) => s.id === 'MSH').length > 1) throw new Hl7ParseError('MSH', 2, null, 'one message per frame: a second MSH was found', 100, 'AR');

  const msh = segs[0].fields;
  // MSH-n is fields[n-1]: MSH-1 is the field separator itself.
  const mf = (n: number) => msh[n - 1] ?? '';
  const comp = (raw: string) => splitComponents(firstRep(raw, d), d);
  const header: Hl7Header = {
    delimiters: d,
    sendingApp: nonEmpty(comp(mf(3))[0]),
    sendingFacility: nonEmpty(comp(mf(4))[0]),
    receivingApp: nonEmpty(comp(mf(5))[0]),
    receivingFacility: nonEmpty(comp(mf(6))[0]),
    messageAtMs: null,
    security: nonEmpty(unescape(mf(8), d)),
    messageType: comp(mf(9)).slice(0, 2).join('^'),
    controlId: unescape(mf(10), d).trim(),
    processingId: nonEmpty(comp(mf(11))[0]),
    version: comp(mf(12))[0]?.trim() ?? '',
  };
  if (!header.controlId) throw new Hl7ParseError('MSH', 1, 10, 'message control id is missing', 101, 'AR');
  if (header.controlId.length > 199) throw new Hl7ParseError('MSH', 1, 10, 'message control id is longer than 199 characters', 102, 'AR');
  const mt = comp(mf(9));
  if (!mt[0]) throw new Hl7ParseError('MSH', 1, 9, 'message type is missing', 101, 'AR');
  if (mt[0] !== 'ORU' || (mt[1] ?? '') !== 'R01') throw new Hl7ParseError('MSH', 1, 9, `message type ${header.messageType} is not supported (ORU^R01 only)`, 200, 'AR');
  if (!header.version) throw new Hl7ParseError('MSH', 1, 12, 'version id is missing', 101, 'AR');
  const versions = options.versions ?? DEFAULT_VERSIONS;
  if (!versions.some((v) => header.version === v || header.version.startsWith(v + '.'))) throw new Hl7ParseError('MSH', 1, 12, `version ${clip(header.version)} is not supported (${versions[0]}–${versions[versions.length - 1]})`, 203, 'AR');
  const zone = options.defaultZoneOffsetMinutes ?? 0;
  if (mf(7)) header.messageAtMs = parseTs(comp(mf(7))[0], zone, () => new Hl7ParseError('MSH', 1, 7, 'not a valid date/time (YYYYMMDDHHMMSS[.S][+/-ZZZZ])', 102, 'AR'));

  let patientId: string | null = null;
  let location: string | null = null;
  let locationFull: string | null = null;
  let obrAt: number | null = null;
  const observations: Hl7Observation[] = [];
  const counts = new Map<string, number>();
  for (const s of segs.slice(1)) {
    const n = (counts.get(s.id) ?? 0) + 1;
    counts.set(s.id, n);
    const f = (i: number) => s.fields[i] ?? '';
    if (s.id === 'PID' && patientId === null) {
      patientId = nonEmpty(comp(f(3))[0]);
    } else if (s.id === 'PV1' && location === null) {
      const pl = comp(f(3));
      location = nonEmpty(pl[0]);
      locationFull = pl.some((x) => x) ? pl.join('^').replace(/\^+$/, '') : null;
    } else if (s.id === 'OBR') {
      const v = comp(f(7))[0];
      obrAt = v ? parseTs(v, zone, () => new Hl7ParseError('OBR', n, 7, 'not a valid date/time (YYYYMMDDHHMMSS[.S][+/-ZZZZ])', 102, 'AE')) : obrAt;
    } else if (s.id === 'OBX') {
      observations.push(parseObx(s.fields, n, d, zone, obrAt ?? header.messageAtMs, obrAt !== null ? 'OBR-7' : header.messageAtMs !== null ? 'MSH-7' : null));
    }
  }
  if (observations.length === 0) throw new Hl7ParseError('OBX', 1, null, 'missing: an ORU^R01 needs at least one OBX (is the message truncated?)', 101, 'AE');

  const best = new Map<string, Hl7Sample & { priority: number }>();
  let ignored = 0;
  for (const o of observations) {
    if (o.channel === null || o.valueType !== 'NM' || o.value === null || o.atMs === null) {
      if (o.valueType !== 'NA') ignored++;
      continue;
    }
    const value = o.unit === 'kPa' ? Math.round(o.value * MMHG_PER_KPA * 100) / 100 : o.value;
    const key = `${o.channel}|${o.atMs}`;
    const prev = best.get(key);
    if (!prev || o.priority < prev.priority) best.set(key, { channel: o.channel, atMs: o.atMs, value, obx: o.obx, priority: o.priority });
  }
  const samples = [...best.values()].map(({ priority: _p, ...s }) => s);
  return {
    header,
    patientId,
    location,
    locationFull,
    observations,
    samples,
    waveforms: observations.filter((o) => o.valueType === 'NA'),
    equipmentId: observations.find((o) => o.equipmentId)?.equipmentId ?? null,
    ignored,
  };
}

function parseObx(fields: string[], n: number, d: Delimiters, zone: number, fallbackAt: number | null, fallbackFrom: 'OBR-7' | 'MSH-7' | null): Hl7Observation {
  const f = (i: number) => fields[i] ?? '';
  const err = (field: number, reason: string, code: Hl7ErrorCode = 102) => new Hl7ParseError('OBX', n, field, reason, code, 'AE');
  const valueType = unescape(f(2), d).trim();
  const id = splitComponents(firstRep(f(3), d), d);
  if (!id[0] && !id[1]) throw err(3, 'observation identifier is missing', 101);
  const status = unescape(f(11), d).trim();
  if (!status) throw err(11, 'result status is missing (required; is the message truncated?)', 101);
  const mapped = lookupObservation(id);
  const unitComps = splitComponents(firstRep(f(6), d), d);
  const unit = lookupUnit(unitComps);
  const rawValue = f(5);
  let value: number | null = null;
  let values: number[] | null = null;
  const reportable = !['X', 'D', 'W', 'N'].includes(status);
  if (valueType === 'NM' && rawValue !== '' && reportable) {
    const v = unescape(firstRep(rawValue, d), d).trim();
    if (!/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(v)) throw err(5, `not a number ("${clip(v)}")`);
    value = Number(v);
  } else if (valueType === 'NM' && rawValue === '' && mapped && reportable) {
    throw err(5, 'value is missing for a final observation (send result status X when it cannot be obtained)', 101);
  } else if (valueType === 'NA' && rawValue !== '') {
    values = splitComponents(firstRep(rawValue, d), d).map((x, i) => {
      const v = x.trim();
      if (!/^[+-]?(\d+(\.\d*)?|\.\d+)$/.test(v)) throw err(5, `waveform value ${i + 1} is not a number ("${clip(v)}")`);
      return Number(v);
    });
  }
  if (mapped && value !== null) {
    if (!unit) throw err(6, `unit "${clip(unitComps.filter((x) => x).join('^'))}" is not known for ${mapped.refId} (expected ${CHANNEL_UNITS[mapped.channel].join(' or ')})`, 103);
    if (!CHANNEL_UNITS[mapped.channel].includes(unit)) throw err(6, `unit ${unit} does not fit ${mapped.refId} (expected ${CHANNEL_UNITS[mapped.channel].join(' or ')})`, 103);
    const spec = CHANNEL_SPECS[mapped.channel];
    const inStore = unit === 'kPa' ? value * MMHG_PER_KPA : value;
    if (inStore < spec.min || inStore > spec.max) throw err(5, `${value} ${unit} is outside the accepted range for ${spec.label} (${spec.min}–${spec.max} ${CHANNEL_UNITS[mapped.channel][0]})`);
  }
  let atMs = fallbackAt;
  let atFrom: Hl7Observation['atFrom'] = fallbackFrom;
  const ts = splitComponents(firstRep(f(14), d), d)[0];
  if (ts) {
    atMs = parseTs(ts, zone, () => err(14, 'not a valid date/time (YYYYMMDDHHMMSS[.S][+/-ZZZZ])'));
    atFrom = 'OBX-14';
  }
  if (mapped && value !== null && atMs === null) throw err(14, 'observation time is missing and neither OBR-7 nor MSH-7 gives one', 101);
  return {
    obx: n,
    valueType,
    code: id[0] ?? '',
    text: id[1] ?? '',
    codingSystem: id[2] ?? '',
    subId: nonEmpty(unescape(f(4), d)),
    channel: mapped?.channel ?? null,
    source: mapped?.source ?? null,
    priority: mapped?.priority ?? 99,
    value,
    values,
    unit,
    unitText: unitComps.filter((x) => x).join('^'),
    resultStatus: status,
    atMs,
    atFrom,
    equipmentId: nonEmpty(splitComponents(firstRep(f(18), d), d)[0]),
  };
}

function delimitersOf(t: string): Delimiters {
  const field = t[3];
  if (/[A-Za-z0-9\r\n ]/.test(field)) throw new Hl7ParseError('MSH', 1, 1, `field separator "${field}" is not valid`, 102, 'AR');
  const end = t.indexOf(field, 4);
  const enc = t.slice(4, end === -1 ? undefined : end);
  if (end === -1 || enc.length < 4 || enc.length > 5) throw new Hl7ParseError('MSH', 1, 2, `encoding characters "${clip(enc)}" must be 4 characters (component, repetition, escape, subcomponent), e.g. ^~\\&`, 102, 'AR');
  const [component, repetition, escape, subcomponent] = enc;
  const all = [field, component, repetition, escape, subcomponent];
  if (new Set(all).size !== 5 || all.some((c) => /[A-Za-z0-9\r\n ]/.test(c))) throw new Hl7ParseError('MSH', 1, 2, `encoding characters "${clip(enc)}" must be distinct punctuation, different from the field separator`, 102, 'AR');
  return { field, component, repetition, escape, subcomponent };
}

function firstRep(raw: string, d: Delimiters): string {
  const i = raw.indexOf(d.repetition);
  return i === -1 ? raw : raw.slice(0, i);
}

/** Components of one field repetition, each unescaped (subcomponents kept joined by '&'). */
function splitComponents(raw: string, d: Delimiters): string[] {
  return raw.split(d.component).map((c) => unescape(c, d));
}

/**
 * Decodes HL7 escape sequences.
 * @example unescape('A\\F\\B', { field: '|', component: '^', repetition: '~', escape: '\\', subcomponent: '&' }) //=> 'A|B'
 */
export function unescape(s: string, d: Delimiters): string {
  if (!s.includes(d.escape)) return s;
  let out = '';
  for (let i = 0; i < s.length; i++) {
    const ch = s[i];
    if (ch !== d.escape) {
      out += ch;
      continue;
    }
    const end = s.indexOf(d.escape, i + 1);
    if (end === -1) {
      out += s.slice(i);
      break;
    }
    const seq = s.slice(i + 1, end);
    switch (seq) {
      case 'F': out += d.field; break;
      case 'S': out += d.component; break;
      case 'T': out += d.subcomponent; break;
      case 'R': out += d.repetition; break;
      case 'E': out += d.escape; break;
      case '.br': out += '\n'; break;
      case 'H': case 'N': break;
      default:
        if (/^X([0-9A-Fa-f]{2})+$/.test(seq)) out += seq.slice(1).match(/../g)!.map((h) => String.fromCharCode(parseInt(h, 16))).join('');
        else out += d.escape + seq + d.escape;
    }
    i = end;
  }
  return out;
}

/** Escapes text for an HL7 field. */
export function escapeHl7(s: string, d: Delimiters): string {
  let out = '';
  for (const ch of s) {
    if (ch === d.escape) out += `${d.escape}E${d.escape}`;
    else if (ch === d.field) out += `${d.escape}F${d.escape}`;
    else if (ch === d.component) out += `${d.escape}S${d.escape}`;
    else if (ch === d.subcomponent) out += `${d.escape}T${d.escape}`;
    else if (ch === d.repetition) out += `${d.escape}R${d.escape}`;
    else if (ch === '\r' || ch === '\n') out += ' ';
    else out += ch;
  }
  return out;
}

/**
 * HL7 DTM/TS → epoch ms. YYYY[MM[DD[HH[MM[SS[.S{1,4}]]]]]][+/-ZZZZ]; without a zone the default
 * offset applies. Returns the result of `bad()` thrown when invalid.
 * @example parseTs('20260301101500+0100', 0, () => new Error()) //=> Date.UTC(2026, 2, 1, 9, 15)
 */
export function parseTs(s: string, defaultOffsetMin: number, bad: () => Error): number {
  const m = /^(\d{4})(\d{2})?(\d{2})?(\d{2})?(\d{2})?(\d{2})?(?:\.(\d{1,4}))?(?:([+-])(\d{2})(\d{2}))?$/.exec(s.trim());
  if (!m) throw bad();
  const [, y, mo = '01', da = '01', h = '00', mi = '00', se = '00', frac, sign, zh, zm] = m;
  const num = [y, mo, da, h, mi, se].map(Number);
  if (num[1] < 1 || num[1] > 12 || num[2] < 1 || num[2] > 31 || num[3] > 23 || num[4] > 59 || num[5] > 59) throw bad();
  const ms = frac ? Math.round(Number('0.' + frac) * 1000) : 0;
  const local = Date.UTC(num[0], num[1] - 1, num[2], num[3], num[4], num[5], ms);
  const check = new Date(local);
  if (check.getUTCDate() !== num[2]) throw bad();
  let offset = defaultOffsetMin;
  if (sign) {
    const oh = Number(zh);
    const om = Number(zm);
    if (oh > 14 || om > 59) throw bad();
    offset = (sign === '-' ? -1 : 1) * (oh * 60 + om);
  }
  return local - offset * 60_000;
}

function nonEmpty(s: string | undefined): string | null {
  const t = (s ?? '').trim();
  return t === '' ? null : t;
}

function clip(s: string): string {
  return s.length > 40 ? s.slice(0, 40) + '…' : s;
}
