import { describe, expect, it } from 'vitest';
import { ZodError } from 'zod';
import { parseEntry } from '@/lib/domain/entry';
import { zodMessage } from '@/lib/_shared/zodMessage';

const id = '3f1c2a9e-5b6d-4e7f-8a9b-0c1d2e3f4a5b';
const at = '2026-03-02T09:10:00Z';
const message = (body: unknown) => {
  try {
    parseEntry(body);
    return null;
  } catch (e) {
    return e instanceof ZodError ? zodMessage(e) : String(e);
  }
};

describe('bedside entries at the boundary', () => {
  it('accepts a dose and an intervention as the device sends them', () => {
    expect(parseEntry({ type: 'dose', id, at, drugId: 'drug-propofol', amount: 30, unit: 'mg', route: 'IV' })).toMatchObject({ type: 'dose', amount: 30 });
    expect(parseEntry({ type: 'intervention', id, at, kind: 'jaw_thrust' })).toMatchObject({ kind: 'jaw_thrust' });
  });
  it('names the field of each problem', () => {
    expect(message({ type: 'dose', id, at, drugId: 'x', amount: 0, unit: 'mg', route: 'IV' })).toBe('amount: must be more than 0');
    expect(message({ type: 'dose', id: 'abc', at, drugId: 'x', amount: 1, unit: 'mg', route: 'IV' })).toBe('id: must be a UUID made on the device');
    expect(message({ type: 'intervention', id, at: 'now', kind: 'jaw_thrust' })).toBe('at: must be an ISO 8601 instant');
    expect(message({ type: 'void', id, at, target: 'dose', targetId: 'd1', reason: 'x' })).toBe('reason: say why (at least 3 characters)');
    expect(message({ nothing: true })).toMatch(/^type: must be dose, intervention/);
  });
});
