import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { MllpDecoder, mllpFrame } from '@/lib/ingest/mllp';

describe('MLLP framing', () => {
  it('decodes frames split at any byte boundary, dropping bytes between frames', () => {
    fc.assert(
      fc.property(fc.array(fc.string({ minLength: 1, maxLength: 60 }).map((s) => s.replace(/[\x0b\x1c]/g, '')).filter((s) => s.length > 0), { minLength: 1, maxLength: 5 }), fc.array(fc.nat(400), { maxLength: 8 }), (msgs, cuts) => {
        const bytes = Buffer.concat([Buffer.from('junk'), ...msgs.map((m) => Buffer.concat([mllpFrame(m), Buffer.from('\r\n')]))]);
        const points = [...new Set(cuts.map((c) => c % (bytes.length + 1)))].sort((a, b) => a - b);
        const d = new MllpDecoder();
        const out: string[] = [];
        let prev = 0;
        for (const p of [...points, bytes.length]) {
          for (const e of d.push(bytes.subarray(prev, p))) if (e.kind === 'message') out.push(e.text);
          prev = p;
        }
        expect(out).toEqual(msgs);
      }),
    );
  });

  it('reports an oversize frame and recovers at the next one', () => {
    const d = new MllpDecoder({ maxBytes: 10 });
    const ev = d.push(Buffer.concat([mllpFrame('x'.repeat(50)), mllpFrame('ok')]));
    expect(ev).toEqual([{ kind: 'oversize', bytes: 50 }, { kind: 'message', text: 'ok' }]);
  });

  it('keeps a 0x1C not followed by CR as data', () => {
    const d = new MllpDecoder();
    expect(d.push(Buffer.from([0x0b, 0x41, 0x1c, 0x42, 0x1c, 0x0d]))).toEqual([{ kind: 'message', text: 'A\x1cB' }]);
  });
});
