/**
 * MLLP framing (HL7 v2 Minimal Lower Layer Protocol): <VT 0x0B> message <FS 0x1C><CR 0x0D>.
 * A streaming decoder: bytes arrive in any chunks; complete frames come out. Bytes outside a frame
 * are dropped (counted); a frame larger than `maxBytes` is an error and the decoder resyncs at the
 * next start byte. Pure.
 */
export const MLLP_START = 0x0b;
export const MLLP_END = 0x1c;
export const MLLP_CR = 0x0d;

/** Wraps one message (text, UTF-8) in an MLLP frame. */
export function mllpFrame(message: string): Buffer {
  return Buffer.concat([Buffer.from([MLLP_START]), Buffer.from(message, 'utf8'), Buffer.from([MLLP_END, MLLP_CR])]);
}

export type MllpEvent = { kind: 'message'; text: string } | { kind: 'oversize'; bytes: number };

export interface MllpDecoderOptions {
  /** Largest message accepted; default 1 MiB. */
  maxBytes?: number;
}

/**
 * @example const d = new MllpDecoder(); d.push(mllpFrame('MSH|x')).map((e) => e.kind) //=> ['message']
 */
export class MllpDecoder {
  private parts: Buffer[] = [];
  private size = 0;
  private inFrame = false;
  private pendingEnd = false;
  private overflowed = false;
  dropped = 0;
  private readonly max: number;

  constructor(options: MllpDecoderOptions = {}) {
    this.max = options.maxBytes ?? 1 << 20;
  }

  push(chunk: Buffer): MllpEvent[] {
    const out: MllpEvent[] = [];
    let i = 0;
    while (i < chunk.length) {
      if (!this.inFrame) {
        const s = chunk.indexOf(MLLP_START, i);
        if (s === -1) {
          this.dropped += chunk.length - i;
          break;
        }
        this.dropped += s - i;
        this.start();
        i = s + 1;
        continue;
      }
      if (this.pendingEnd) {
        this.pendingEnd = false;
        if (chunk[i] === MLLP_CR) {
          i++;
          this.finish(out);
          continue;
        }
        // FS not followed by CR: it was data.
        this.append(Buffer.from([MLLP_END]), out);
      }
      // find the next FS or a new VT (a sender that restarts a frame)
      let j = i;
      while (j < chunk.length && chunk[j] !== MLLP_END && chunk[j] !== MLLP_START) j++;
      if (j > i) this.append(chunk.subarray(i, j), out);
      if (j >= chunk.length) break;
      if (chunk[j] === MLLP_START) {
        this.dropped += this.size;
        this.start();
        i = j + 1;
        continue;
      }
      this.pendingEnd = true;
      i = j + 1;
    }
    return out;
  }

  private start() {
    this.inFrame = true;
    this.parts = [];
    this.size = 0;
    this.pendingEnd = false;
    this.overflowed = false;
  }

  private append(b: Buffer, out: MllpEvent[]) {
    if (this.overflowed) {
      this.size += b.length;
      return;
    }
    this.size += b.length;
    if (this.size > this.max) {
      this.overflowed = true;
      this.parts = [];
      out.push({ kind: 'oversize', bytes: this.size });
      return;
    }
    this.parts.push(Buffer.from(b));
  }

  private finish(out: MllpEvent[]) {
    if (!this.overflowed) out.push({ kind: 'message', text: Buffer.concat(this.parts).toString('utf8') });
    this.inFrame = false;
    this.parts = [];
    this.size = 0;
  }
}
