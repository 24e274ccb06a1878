/**
 * Fuzz: 10,000 mutations of a valid PCD-01 message (byte flips, deletions, insertions of
 * delimiters, truncation, segment shuffles). Every one must parse or fail with a typed
 * Hl7ParseError (never another exception), and the ACK built for it must read back AA/AE/AR with
 * the control id when one was readable.
 */
import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { buildAck, buildOru, Hl7ParseError, parseHl7, readAck } from '@/lib/ingest/hl7';
import { mutate, mutationArb as mutation } from './mutate';

const base = buildOru({ controlId: 'C1', at: new Date(Date.UTC(2026, 2, 1, 9)), location: 'KB-ROOM-1', sendingFacility: 'KB', values: { etco2: 38, rr: 14, spo2: 97, hr: 72 } });
describe('HL7 fuzz', () => {
  it('answers 10,000 mutated messages with an ACK or a NACK and never crashes', () => {
    let accepted = 0;
    let refused = 0;
    fc.assert(
      fc.property(fc.array(mutation, { minLength: 1, maxLength: 4 }), (ms) => {
        const text = mutate(base, ms);
        let code: 'AA' | 'AE' | 'AR';
        let controlId = '';
        try {
          const m = parseHl7(text);
          code = 'AA';
          controlId = m.header.controlId;
          accepted++;
          for (const s of m.samples) expect(Number.isFinite(s.value) && Number.isFinite(s.atMs)).toBe(true);
        } catch (e) {
          expect(e).toBeInstanceOf(Hl7ParseError);
          code = (e as Hl7ParseError).ack;
          refused++;
        }
        const ack = buildAck(code, { controlId, at: new Date(0), ackControlId: 'F' }, code === 'AA' ? undefined : { segment: 'OBX', occurrence: 1, field: 5, code: 102, text: 'x' });
        const r = readAck(ack);
        expect(['AA', 'AE', 'AR']).toContain(r.code);
        if (code !== 'AA') expect(r.err).not.toBeNull();
      }),
      { numRuns: 10_000, seed: 20261201 },
    );
    expect(accepted + refused).toBe(10_000);
    expect(refused).toBeGreaterThan(1000);
  }, 60_000);
});
