/**
 * ACK^R01 messages: MSA AA after a durable store; AE (content error) or AR (message refused) with
 * an ERR segment naming the segment, its occurrence and the field (ERR-2, v2.5+) and the HL7
 * table 0357 code (ERR-3), plus the v2.3-style ERR-1 so older senders can read it too.
 */
import { escapeHl7, type Delimiters, type Hl7ErrorCode } from './parseHl7';

const STD: Delimiters = { field: '|', component: '^', repetition: '~', escape: '\\', subcomponent: '&' };

const CODE_TEXT: Record<Hl7ErrorCode, string> = {
  100: 'Segment sequence error',
  101: 'Required field missing',
  102: 'Data type error',
  103: 'Table value not found',
  200: 'Unsupported message type',
  203: 'Unsupported version id',
  204: 'Unknown key identifier',
  207: 'Application internal error',
};

export interface AckInput {
  /** MSH-10 of the message being answered ('' when it could not be read). */
  controlId: string;
  sendingApp?: string | null;
  sendingFacility?: string | null;
  version?: string | null;
  /** The instant the ACK is made. */
  at: Date;
  /** MSH-10 of the ACK itself. */
  ackControlId: string;
}

export interface AckError {
  segment: string;
  occurrence: number;
  field: number | null;
  code: Hl7ErrorCode;
  text: string;
}

/**
 * An ACK message (segments separated by \r).
 * @example buildAck('AA', { controlId: '42', at: new Date(0), ackControlId: 'A1' }).split('\r')[1] //=> 'MSA|AA|42'
 */
export function buildAck(code: 'AA' | 'AE' | 'AR', input: AckInput, error?: AckError, text?: string): string {
  const e = (s: string | null | undefined) => escapeHl7(s ?? '', STD);
  const version = input.version && /^2\.\d+(\.\d+)?$/.test(input.version) ? input.version : '2.6';
  const msh = ['MSH', '^~\\&', 'PLATEAU', 'PLATEAU', e(input.sendingApp), e(input.sendingFacility), hl7Ts(input.at), '', 'ACK^R01^ACK', e(input.ackControlId), 'P', version].join('|');
  const msaText = error ? error.text : text ?? '';
  const segs = [msh, ['MSA', code, e(input.controlId), e(msaText)].join('|').replace(/\|+$/, '')];
  if (error && code !== 'AA') {
    const loc = [error.segment, String(error.occurrence), error.field === null ? '' : String(error.field)];
    const err1 = [...loc, `${error.code}&${e(CODE_TEXT[error.code])}`].map((x) => x.replace(/\^/g, '')).join('^');
    segs.push(['ERR', err1, loc.join('^').replace(/\^+$/, ''), `${error.code}^${e(CODE_TEXT[error.code])}^HL70357`, 'E', '', '', '', e(error.text)].join('|'));
  }
  return segs.join('\r') + '\r';
}

/** An instant as HL7 DTM in UTC with its zone, e.g. 20260301091500.123+0000. */
export function hl7Ts(at: Date): string {
  const p = (n: number, w = 2) => String(n).padStart(w, '0');
  return `${at.getUTCFullYear()}${p(at.getUTCMonth() + 1)}${p(at.getUTCDate())}${p(at.getUTCHours())}${p(at.getUTCMinutes())}${p(at.getUTCSeconds())}.${p(at.getUTCMilliseconds(), 3)}+0000`;
}

/** Reads MSA-1 and MSA-2 of an ACK (for senders: simulator, tests, bench). */
export function readAck(ack: string): { code: string; controlId: string; text: string; err: string | null } {
  const segs = ack.split(/\r\n|\r|\n/);
  const msa = segs.find((s) => s.startsWith('MSA|'))?.split('|') ?? [];
  const err = segs.find((s) => s.startsWith('ERR|'));
  return { code: msa[1] ?? '', controlId: msa[2] ?? '', text: msa[3] ?? '', err: err ?? null };
}
