/**
 * handleHl7Text (parse → store → ACK) with a stand-in store: what is answered when, and that
 * nothing is stored for a message that is refused. The store itself runs against real databases
 * in tests/integration/hl7.test.ts.
 */
import { describe, expect, it } from 'vitest';
import { handleHl7Text } from '@/lib/server/mllpServer';
import { UnknownDeviceError, type Hl7Store, type StoreResult } from '@/lib/db/hl7Store';
import { buildOru, readAck } from '@/lib/ingest/hl7';

const base = buildOru({ controlId: 'C1', at: new Date(Date.UTC(2026, 2, 1, 9)), location: 'KB-ROOM-1', sendingFacility: 'KB', values: { etco2: 38, rr: 14, spo2: 97, hr: 72 } });
const accepted: StoreResult = { messageId: 'm1', status: 'accepted', caseId: 'c1', roomId: 'room-1', deviceId: 'd1', stored: 4, skipped: 0, duplicateOf: null };

/** A store that records calls and answers with `result` (or throws it), after a tick. */
function fakeStore(result: StoreResult | Error) {
  const calls: string[] = [];
  const store = {
    async store(_m: unknown, raw: string) {
      calls.push(raw);
      await new Promise((r) => setTimeout(r, 1));
      if (result instanceof Error) throw result;
      return result;
    },
  } as unknown as Hl7Store;
  return { store, calls };
}

describe('handleHl7Text', () => {
  it('answers AA only once the store has resolved, saying how many samples were stored', async () => {
    const { store, calls } = fakeStore(accepted);
    const r = await handleHl7Text(store, base, { kind: 'http', tokenId: 't' });
    expect(calls).toHaveLength(1);
    expect(r.code).toBe('AA');
    expect(readAck(r.ack)).toMatchObject({ code: 'AA', controlId: 'C1', text: '4 samples stored' });
  });

  it('answers AE "nothing was saved" when the store fails, and AR naming MSH-4 for an unknown device', async () => {
    const failed = await handleHl7Text(fakeStore(new Error('disk full')).store, base, { kind: 'mllp', address: '127.0.0.1' });
    expect([failed.code, readAck(failed.ack).text]).toEqual(['AE', 'storage failed; nothing was saved, send again']);
    const unknown = await handleHl7Text(fakeStore(new UnknownDeviceError('MSH-4: sending facility KB is not a configured device')).store, base, { kind: 'mllp', address: '127.0.0.1' });
    expect(unknown.code).toBe('AR');
    expect(readAck(unknown.ack).err).toContain('MSH^1^4');
  });

  it('still answers AA when the after-commit callback throws (the samples are stored)', async () => {
    const onStored = () => {
      throw new Error('queue gone');
    };
    const r = await handleHl7Text(fakeStore(accepted).store, base, { kind: 'http', tokenId: 't' }, { onStored });
    expect(r.code).toBe('AA');
  });

  it('refuses a message with a NUL character, naming segment and field, before storing anything (PostgreSQL cannot store one)', async () => {
    const cases: [string, string, string, string][] = [
      [base.replace('PID|||', 'PID|||\0'), 'AE', 'PID^1^3', 'PID-3: contains a NUL character'],
      [base.replace('|KB|', '|K\0B|'), 'AR', 'MSH^1^4', 'MSH-4: contains a NUL character'],
      [base.replace('|14|', '|14|\0'), 'AE', 'OBX^2^6', 'OBX[2]-6: contains a NUL character'],
    ];
    for (const [text, code, loc, msg] of cases) {
      const { store, calls } = fakeStore(accepted);
      const r = await handleHl7Text(store, text, { kind: 'http', tokenId: 't' });
      expect(calls).toHaveLength(0);
      expect(r.code).toBe(code);
      expect(r.error).toBe(msg);
      expect(readAck(r.ack).err).toContain(loc);
    }
  });
});
